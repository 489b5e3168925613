// Server-side test suites talk to the private cluster's test database, never the demo one,
// and send mail only to an in-process SMTP fake. Like a launcher, this sets the environment of
// the jest worker; the code reads it only through server/src/config.ts (one test that needs
// another value passes overrides to createApp/loadConfig instead of changing process.env).
process.env.NODE_ENV = 'test';
process.env.PGDATABASE = process.env.SPINCYCLE_TEST_DB ?? 'spincycle_test';
process.env.LOG_LEVEL = process.env.LOG_LEVEL ?? 'silent';
// A cheaper scrypt cost keeps sign-up-heavy suites quick; the stored format records it.
process.env.SCRYPT_LOG_N = '11';
