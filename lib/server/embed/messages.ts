// What a client viewer reads when a widget cannot be shown. Plain words; no internals.

export type AccessFailure = 'missing' | 'malformed' | 'invalid' | 'mismatch' | 'expired' | 'revoked' | 'rotated' | 'archived' | 'unpublished' | 'origin';

export function viewerMessage(f: AccessFailure, firmName: string | null): { title: string; body: string } {
  const firm = firmName ?? 'the engineering firm that supplied it';
  switch (f) {
    case 'missing':
    case 'malformed':
    case 'invalid':
      return {
        title: 'This widget link is not valid',
        body: 'The snippet on this page may have been altered or copied incompletely. Ask your web team to paste the snippet again exactly as it was supplied.',
      };
    case 'mismatch':
      return {
        title: 'This snippet does not match its pass',
        body: 'The widget id in the snippet is not the one its access pass was issued for. Ask your web team to paste the snippet again exactly as it was supplied.',
      };
    case 'expired':
      return { title: 'Access to this widget has expired', body: `Ask ${firm} to renew the pass for your organisation.` };
    case 'revoked':
      return { title: 'Access to this widget was withdrawn', body: `${capital(firm)} has revoked this pass. Contact them if you still need the widget.` };
    case 'rotated':
      return { title: 'This widget needs a new snippet', body: `${capital(firm)} has changed your organisation’s access key. Ask them for a new snippet.` };
    case 'archived':
      return { title: 'Access is suspended', body: `${capital(firm)} has suspended widget access for your organisation. Contact them to restore it.` };
    case 'unpublished':
      return { title: 'This widget is not published at the moment', body: `${capital(firm)} has taken this widget down, perhaps to publish a revised version. Try again later.` };
    case 'origin':
      return { title: 'This widget is not allowed on this site', body: `Widgets from ${firm} can only be shown on the web addresses they agreed with your organisation.` };
  }
}

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
