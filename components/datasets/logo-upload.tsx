'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Banner } from '@/components/ui/banner';
import { Card } from '@/components/ui/card';
import { removeLogo, saveLogo } from '@/components/hooks/use-settings';
import { errorMessage } from '@/lib/client/api';

/** Firm logo for widgets, embeds and PDFs. The owner uploads; everyone sees the current one. */
export function LogoUpload({ firmId, canEdit }: { firmId: string; canEdit: boolean }) {
  const [file, setFile] = useState<File | null>(null);
  const [version, setVersion] = useState(0);
  const [missing, setMissing] = useState(false);
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);

  async function send(method: 'PUT' | 'DELETE') {
    if (method === 'PUT' && !file) return;
    setPending(true);
    setError(null);
    setDone(null);
    try {
      if (method === 'PUT') await saveLogo(file!);
      else await removeLogo();
      setMissing(false);
      setVersion((v) => v + 1);
      setDone(method === 'PUT' ? 'Logo saved. Widgets, embeds and PDFs now show it.' : 'Logo removed.');
    } catch (err) {
      setError(errorMessage(err));
    } finally {
      setPending(false);
    }
  }

  return (
    <Card title="Logo" description="Shown in widgets, embeds and PDF snapshots. PNG, JPEG or WebP, at most 512 KB and 2000 × 2000 px; it is re-encoded as PNG and its metadata removed. SVG is not accepted.">
      <div className="flex flex-wrap items-center gap-4">
        <div className="flex h-16 w-40 items-center justify-center rounded-md border border-ink-200 bg-white">
          {missing ? (
            <span className="text-xs text-ink-600">No logo yet</span>
          ) : (
            // eslint-disable-next-line @next/next/no-img-element -- served by our own route, sized by the box
            <img key={version} src={`/api/branding/logo/${firmId}?v=${version}`} alt="Current firm logo" className="max-h-14 max-w-36 object-contain" onError={() => setMissing(true)} />
          )}
        </div>
        {canEdit && (
          <div className="space-y-2">
            <label htmlFor="logo-file" className="block text-sm font-medium text-ink-800">
              Logo file
            </label>
            <input id="logo-file" type="file" accept="image/png,image/jpeg,image/webp" className="block text-sm" onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
            <div className="flex gap-2">
              <Button size="sm" onClick={() => send('PUT')} disabled={!file} pending={pending} pendingLabel="Saving…">
                Upload logo
              </Button>
              {!missing && (
                <Button size="sm" variant="secondary" onClick={() => send('DELETE')} disabled={pending}>
                  Remove
                </Button>
              )}
            </div>
          </div>
        )}
      </div>
      {error && (
        <Banner tone="danger" title="Logo refused" className="mt-3">
          {error}
        </Banner>
      )}
      {done && (
        <Banner tone="success" className="mt-3">
          {done}
        </Banner>
      )}
    </Card>
  );
}
