// Imported first by the production entry points: React and React Router pick their
// development or production build from NODE_ENV when they are first loaded, so it must
// be set before any other import runs.
process.env.NODE_ENV ??= 'production'
