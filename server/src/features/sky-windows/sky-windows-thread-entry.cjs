// Entry of a sky-windows worker thread. The web process runs its TypeScript through tsx
// (`node --import tsx server/src/server.ts`, see server/scripts/setup.mjs → startTs), and the
// tests through jest's own transform, which a worker thread does not inherit: so the thread
// registers tsx's require hook itself and then loads its TypeScript body. The pool sets
// TSX_TSCONFIG_PATH to the project's tsconfig.json, whose `paths` map @spincycle/shared/*.
require('tsx/cjs/api').register();
require('./sky-windows-thread.ts');
