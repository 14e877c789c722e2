import { freshBenchDatabase } from './support.js';
const d = await freshBenchDatabase();
await d.close();
