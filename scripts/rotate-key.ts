/** `npm run rotate-medical-key`: with the app stopped, seals every health detail again under a new key. */
import { ConfigError, parseConfig } from '../api/config.ts';
import { installMedicalKeys } from '../api/crypto/medical-keys.ts';
import { createDb } from '../api/db/index.ts';
import { createFileStore } from '../api/files/store.ts';
import { rotateMedicalKey } from './rotate-key-lib.ts';
import path from 'node:path';
import { startCluster, ensureDatabase } from './pg.ts';

const root = path.resolve(import.meta.dirname, '..');
const config = (() => {
  try {
    return parseConfig(process.env);
  } catch (err) {
    console.error(err instanceof ConfigError ? err.message : err);
    process.exit(1);
  }
})();
if (config.medicalDataKey) {
  console.error('MEDICAL_DATA_KEY is set in the environment: rotate by putting a new key there yourself; this command rotates the key file.');
  process.exit(2);
}
installMedicalKeys(config);
const cluster = config.databaseUrl ? null : await startCluster({ dataDir: path.join(root, '.data', 'postgres'), port: config.dbPort, password: config.dbPassword, quiet: true });
if (cluster) await ensureDatabase(cluster, 'plinth');
const handle = createDb(config.databaseUrl ?? cluster!.url('plinth'), { max: 2 });
const files = createFileStore(config.files);
try {
  const report = await rotateMedicalKey({ db: handle.db, files, keyFile: config.medicalDataKeyFile });
  console.log(`New medical data key ${report.keyId} in ${config.medicalDataKeyFile}: ${report.values} values and ${report.files} files sealed again. Start Plinth again.`);
} finally {
  files.close();
  await handle.close();
  await cluster?.stop();
}
