// Browser tests drive a real chromium against a real server: allow a minute per test.
jest.setTimeout(60_000);
