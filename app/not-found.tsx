import type { Metadata } from 'next';
import { NotFoundScreen } from '@/components/segments/not-found-screen';
import { PageFrame } from '@/components/segments/page-frame';

export const metadata: Metadata = { title: 'Page not found' };

// Any address that matches no page.
export default function NotFound() {
  return (
    <PageFrame>
      <NotFoundScreen
        title="There is no page at this address"
        links={[
          { href: '/', label: 'Stochos home' },
          { href: '/app/models', label: 'Your models' },
        ]}
      >
        <p>The link may be mistyped or out of date. A widget link from a client portal works only inside that portal.</p>
      </NotFoundScreen>
    </PageFrame>
  );
}
