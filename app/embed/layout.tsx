import type { Metadata } from 'next';
import './embed.css';

// The client viewer's frame: no dashboard chrome, no sign-in code; only the widget.
export const metadata: Metadata = {
  title: { absolute: 'Stochos widget' },
  robots: { index: false, follow: false },
  referrer: 'no-referrer',
};

export default function EmbedLayout({ children }: { children: React.ReactNode }) {
  return <main className="mx-auto w-full max-w-[1100px] p-px">{children}</main>;
}
