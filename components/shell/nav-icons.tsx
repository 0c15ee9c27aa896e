export type NavIcon = 'models' | 'clients' | 'team' | 'billing' | 'settings' | 'audit';

const paths: Record<NavIcon, React.ReactNode> = {
  models: (
    <>
      <path d="M2 13.5h12" />
      <path d="M3.5 13.5V10M6.5 13.5V5.5M9.5 13.5V7.5M12.5 13.5v-2" />
    </>
  ),
  clients: (
    <>
      <rect x="2" y="3" width="12" height="10" rx="1.5" />
      <path d="M2 6h12M5 9h3" />
    </>
  ),
  team: (
    <>
      <circle cx="6" cy="5.5" r="2.2" />
      <path d="M2 13c.4-2.3 2-3.5 4-3.5s3.6 1.2 4 3.5" />
      <path d="M10.5 3.6a2 2 0 0 1 0 3.8M12 9.8c1 .5 1.7 1.6 2 3.2" />
    </>
  ),
  billing: (
    <>
      <rect x="2" y="3.5" width="12" height="9" rx="1.5" />
      <path d="M2 6.5h12M4.5 10h2.5" />
    </>
  ),
  settings: (
    <>
      <path d="M3 4h6M12 4h1M3 8h2M8 8h5M3 12h7M13 12h0" />
      <circle cx="10.5" cy="4" r="1.4" />
      <circle cx="6.5" cy="8" r="1.4" />
      <circle cx="11.5" cy="12" r="1.4" />
    </>
  ),
  audit: (
    <>
      <path d="M4 2.5h6l2.5 2.5v8.5h-8.5z" />
      <path d="M6 7h4.5M6 9.5h4.5M6 12h2.5" />
    </>
  ),
};

export function NavIconSvg({ name }: { name: NavIcon }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4 flex-none" fill="none" stroke="currentColor" strokeWidth="1.4" strokeLinecap="round" strokeLinejoin="round">
      {paths[name]}
    </svg>
  );
}
