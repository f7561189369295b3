// Thread entry when the service runs from TypeScript source (tsx, vitest): register tsx's
// ESM hooks in this thread, wait for them, then load the real entry. Registering first and
// importing after makes the order explicit, where an --import flag leaves it to start-up timing.
// dist/ never uses this file: the pool loads worker.js there.
import { register } from 'tsx/esm/api';

register();
const entry = await import('./worker.ts');
export default entry.default;
