// Imported first by `npm run dev` (see mode-production.ts for why it comes first).
process.env.NODE_ENV ??= 'development'
