import { cx } from './cx';

export interface FormErrorProps {
  /** Form-level messages (from the server's "_" field, a 409, a 429, a network failure ...). */
  messages?: readonly string[];
  /** How many fields carry their own message; adds "check the fields marked below" when there is no other message. */
  fieldErrorCount?: number;
  className?: string;
}

/** The summary shown above a form. Announced to screen readers when it appears. */
export function FormError({ messages = [], fieldErrorCount = 0, className }: FormErrorProps) {
  const lines = messages.length ? messages : fieldErrorCount > 0 ? [`${fieldErrorCount === 1 ? 'One field needs' : `${fieldErrorCount} fields need`} attention: see the message beside it.`] : [];
  if (!lines.length) return null;
  return (
    <div role="alert" className={cx('flex gap-2.5 rounded-md border border-danger-600/40 border-l-4 border-l-danger-700 bg-danger-50 px-3 py-2.5 text-sm text-danger-700', className)}>
      <svg aria-hidden="true" viewBox="0 0 16 16" className="mt-0.5 h-4 w-4 flex-none">
        <path d="M8 1.5 15 14H1L8 1.5Z" fill="currentColor" />
        <path d="M8 6v3.5M8 11.3v.2" stroke="#fff" strokeWidth="1.6" strokeLinecap="round" />
      </svg>
      {lines.length === 1 ? (
        <p className="font-medium">{lines[0]}</p>
      ) : (
        <ul className="list-disc space-y-0.5 pl-4 font-medium">
          {lines.map((l) => (
            <li key={l}>{l}</li>
          ))}
        </ul>
      )}
    </div>
  );
}
