import { parseConfig } from '/work/wt/scale/api/config.ts';
import { openScaleDatabase } from '/work/wt/scale/scripts/scale-db.ts';
const s = await openScaleDatabase(parseConfig({}));
console.log('up', s.url);
process.on('SIGTERM', async () => { await s.close(); process.exit(0); });
setInterval(() => {}, 1000);
