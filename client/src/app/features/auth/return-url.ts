/**
 * Where to go after signing in: the `returnUrl` when it is a path inside this application,
 * home otherwise. Refusing `//host` and `/\host` keeps the parameter from sending people
 * to another site (an open redirect).
 */
export function safeReturnUrl(returnUrl: string | null | undefined): string {
  if (!returnUrl || !returnUrl.startsWith('/') || returnUrl.startsWith('//') || returnUrl.startsWith('/\\')) return '/';
  if (returnUrl.startsWith('/sign-in')) return '/';
  return returnUrl;
}
