import { EmbedNotice } from './embed-notice';

// Inside the client's frame, in the widget's own look (the refusal notice's markup, which is plain and light): the
// reference the server's log line carries, when there is one, and a retry that loads the frame afresh (the loader
// hands the pass over again when the frame asks).
export function EmbedError({ reference }: { reference: string | null }) {
  return (
    <EmbedNotice
      tone="danger"
      title="This widget could not be shown"
      body={`Something went wrong while preparing it. Try again; if it keeps failing, tell the engineering firm that supplied it${reference ? ' and quote the reference' : ''}.`}
    >
      {reference ? (
        <p className="mt-2 text-xs text-ink-600">
          Reference <code data-testid="error-reference" className="font-mono text-ink-800">{reference}</code>
        </p>
      ) : null}
      <button
        type="button"
        onClick={() => window.location.reload()}
        className="mt-3 inline-flex h-8 items-center rounded-md border border-ink-300 bg-white px-3 text-sm font-medium text-ink-800 shadow-sm hover:border-ink-400 hover:bg-ink-50"
      >
        Try again
      </button>
    </EmbedNotice>
  );
}

/** An address under /embed/ that is no widget's. */
export const EMBED_NOT_FOUND = {
  title: 'This widget is not here',
  body: 'The widget link may be incomplete. Ask your web team to paste the snippet again exactly as it was supplied.',
};
