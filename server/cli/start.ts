/** `npm start`: the built app and the API on one port, with a project-local PostgreSQL unless DATABASE_URL is set. */
import { runServer } from '../index';

await runServer('start');
