'use client';

import { useState } from 'react';
import { Banner, Button, TextField } from '@/components/ui';
import { ApiError, errorMessage } from '@/lib/client/api';

export interface SaveVersionBarProps {
  /** The version the edit started from (0 when none). */
  baseVersion: number;
  dirty: boolean;
  valid: boolean;
  /** Saves; resolves with the new version number. */
  onSave: (note: string) => Promise<number>;
  /** Called on 422 with the server's field messages. */
  onFieldErrors: (fields: Record<string, string[]>) => void;
  /** Loads the newest version into the editor (after a 409). */
  onReload: () => void;
}

/** "Save version" with an optional note; a 409 says who saved a newer version and offers to load it. */
export function SaveVersionBar({ baseVersion, dirty, valid, onSave, onFieldErrors, onReload }: SaveVersionBarProps) {
  const [note, setNote] = useState('');
  const [pending, setPending] = useState(false);
  const [conflict, setConflict] = useState<string | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [saved, setSaved] = useState<number | null>(null);

  async function save() {
    setPending(true);
    setConflict(null);
    setMessage(null);
    setSaved(null);
    try {
      const n = await onSave(note.trim());
      setSaved(n);
      setNote('');
    } catch (err) {
      if (err instanceof ApiError && err.status === 409) setConflict(err.message);
      else if (err instanceof ApiError && err.status === 422 && err.fields) {
        onFieldErrors(err.fields);
        setMessage('The model was not saved: fix the fields marked in the editor, then save again.');
      } else setMessage(errorMessage(err));
    } finally {
      setPending(false);
    }
  }

  return (
    <div className="space-y-2">
      <form
        className="flex flex-wrap items-end gap-2"
        onSubmit={(e) => {
          e.preventDefault();
          void save();
        }}
      >
        <TextField
          label="Note for this version (optional)"
          value={note}
          maxLength={2000}
          onChange={(e) => setNote(e.target.value)}
          placeholder="e.g. Spacer tolerance tightened after supplier review"
          className="min-w-[16rem] flex-1"
        />
        <Button type="submit" pending={pending} pendingLabel="Saving…" disabled={!valid}>
          {baseVersion === 0 ? 'Save version 1' : `Save version ${baseVersion + 1}`}
        </Button>
      </form>
      <p className="text-xs text-ink-600" role="status">
        {!valid
          ? 'Fix the problems listed in the editor to save a version.'
          : dirty
            ? `Unsaved changes since ${baseVersion === 0 ? 'the starting model' : `version ${baseVersion}`}.`
            : baseVersion === 0
              ? 'Nothing saved yet: the starting model is not a version until you save it.'
              : `No changes since version ${baseVersion}.`}
      </p>
      {saved ? (
        <Banner tone="success" title={`Version ${saved} saved`}>
          It is kept unchanged from now on. A checker can now compare it with the previous version and sign it off.
        </Banner>
      ) : null}
      {conflict ? (
        <Banner
          tone="warn"
          title="A newer version exists"
          action={
            <>
              <Button
                size="sm"
                variant="secondary"
                onClick={() => {
                  setConflict(null);
                  onReload();
                }}
              >
                Load the newer version (discards your edits)
              </Button>
            </>
          }
        >
          {conflict} To keep your edits, export them as JSON first, then load the newer version and apply them again.
        </Banner>
      ) : null}
      {message ? <Banner tone="danger">{message}</Banner> : null}
    </div>
  );
}
