import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { PageHeader } from '@/components/ui/page-header';
import { SettingsForm } from '@/components/settings/settings-form';
import { ApiKeysPanel } from '@/components/api-keys/api-keys-panel';
import { LogoUpload } from '@/components/datasets/logo-upload';
import { NotificationPrefs } from '@/components/settings/notification-prefs';
import { ChangePassword } from '@/components/settings/change-password';

export const metadata: Metadata = { title: 'Settings' };

export default async function SettingsPage() {
  const member = await requirePageMember('firm.read', '/app/settings');
  return (
    <>
      <PageHeader title="Settings" description="Your own e-mail notifications and password; your firm’s name, defaults for new models, branding of widgets and snapshots, and the publishing rule." />
      <div className="mb-8">
        <NotificationPrefs role={member.role} />
      </div>
      <SettingsForm canEdit={can(member.role, 'settings.manage')} />
      <div className="mt-8">
        <LogoUpload firmId={member.firmId} canEdit={can(member.role, 'settings.manage')} />
      </div>
      <div className="mt-8">
        <ChangePassword email={member.email} />
      </div>
      {can(member.role, 'apikeys.manage') && (
        <div className="mt-8">
          <ApiKeysPanel />
        </div>
      )}
    </>
  );
}
