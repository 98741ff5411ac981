/** What `?error=` on the sign-in page means, in words. Unknown codes get the general message. */
const MESSAGES: Record<string, string> = {
  signin_failed: 'Sign-in did not complete. Try again.',
  session_ended: 'Your session has ended. Sign in again to carry on where you were.',
  access_denied: 'Sign-in was cancelled at the identity provider. Try again when you are ready.',
  account_inactive: 'Your Localis account is switched off. The consortium office can switch it on again.',
  provider_unreachable: 'The consortium sign-in service is not answering. Try again in a few minutes.',
  rate_limited: 'Too many sign-in attempts from your address. Wait a minute and try again.',
};

export function signInErrorMessage(code: unknown): string | null {
  if (typeof code !== 'string' || code === '') return null;
  return MESSAGES[code] ?? MESSAGES.signin_failed;
}
