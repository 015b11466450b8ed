/** `npm run dev`: everything `npm start` runs, plus Vite's hot-reloading dev server on 5173. */
process.argv.push('--dev');
await import('./start');

export {};
