/** Where the browser suite's own server listens (never the `npm start` port). */
export const E2E_PORT = Number(process.env.E2E_PORT ?? 4310);
export const E2E_SMTP_PORT = Number(process.env.E2E_SMTP_PORT ?? 2535);
export const E2E_MAIL_HTTP_PORT = Number(process.env.E2E_MAIL_HTTP_PORT ?? 4398);
export const BASE_URL = `http://127.0.0.1:${E2E_PORT}`;
export const E2E_DB = process.env.SPINCYCLE_E2E_DB ?? 'spincycle_e2e';
