import { safeReturnUrl } from './return-url';

describe('safeReturnUrl', () => {
  it('keeps paths inside the application, with their query', () => {
    expect(safeReturnUrl('/network?sort=code')).toBe('/network?sort=code');
  });

  it.each([
    undefined,
    null,
    '',
    'network',
    'https://elsewhere.example.net/',
    '//elsewhere.example.net',
    '/\\elsewhere.example.net',
    '/sign-in?returnUrl=%2F',
  ])('falls back to home for %p', (value) => {
    expect(safeReturnUrl(value)).toBe('/');
  });
});
