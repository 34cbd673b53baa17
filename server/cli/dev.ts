/** `npm run dev`: like `npm start`, but the client comes from Vite's dev server (middleware mode) on the same port. */
import { runServer } from '../index';

process.env.NODE_ENV ??= 'development';
await runServer('dev');
