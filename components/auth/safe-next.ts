export { safeNext } from '@/lib/core/auth/next-path';
/** next-auth's `?error=` codes in plain words. */
export const SIGN_IN_ERRORS: Record<string, string> = {
  Verification: 'That sign-in link has expired or was already used. Ask for a new one.',
  CredentialsSignin: 'That e-mail and password do not match an active account. Check both and try again, or ask for a sign-in link.',
  EmailSignin: 'We could not send the sign-in e-mail. Try again in a moment, or sign in with your password.',
  SessionRequired: 'Sign in to see that page.',
  AccessDenied: 'This account cannot sign in. It may have been removed from its firm: ask the firm’s account owner.',
  Configuration: 'Sign-in is not set up correctly on this server. Tell whoever runs your Stochos installation.',
  Default: 'Signing in did not work. Try again.',
};

export function signInErrorText(code: string | null | undefined): string | null {
  if (!code) return null;
  return SIGN_IN_ERRORS[code] ?? SIGN_IN_ERRORS.Default;
}
