/**
 * `npm run rotate-medical-key`: with the app stopped, seals every health detail again under a new key.
 * - Key in the environment: MEDICAL_DATA_KEY (the key in use) and MEDICAL_DATA_KEY_NEW (the new one);
 *   afterwards start every process with MEDICAL_DATA_KEY set to the new key.
 * - Key file (.data/medical-data.key, or MEDICAL_DATA_KEY_FILE): a new key is drawn (or taken from
 *   MEDICAL_DATA_KEY_NEW) and written to the file; the app reads it on its next start.
 */
import { ConfigError, parseConfig } from '../api/config.ts';
import { installMedicalKeys } from '../api/crypto/medical-keys.ts';
import { createDb } from '../api/db/index.ts';
import { createFileStore } from '../api/files/store.ts';
import { rotateMedicalKey, rotateMedicalKeyFromEnv } from './rotate-key-lib.ts';
import path from 'node:path';
import { startCluster, ensureDatabase } from './pg.ts';

const root = path.resolve(import.meta.dirname, '..');
const { MEDICAL_DATA_KEY_NEW: newKey, ...env } = process.env;
const config = (() => {
  try {
    return parseConfig(env);
  } catch (err) {
    console.error(err instanceof ConfigError ? err.message : err);
    process.exit(1);
  }
})();
if (newKey !== undefined && !/^[A-Za-z0-9+/]{43}=$/.test(newKey.trim())) {
  console.error('MEDICAL_DATA_KEY_NEW must be 32 bytes in base64 (openssl rand -base64 32).');
  process.exit(1);
}
if (config.medicalDataKey && !newKey) {
  console.error('MEDICAL_DATA_KEY is set in the environment: give the new key as MEDICAL_DATA_KEY_NEW (openssl rand -base64 32), then start Plinth with MEDICAL_DATA_KEY set to it.');
  process.exit(2);
}
installMedicalKeys(config);
const cluster = config.databaseUrl ? null : await startCluster({ dataDir: path.join(root, '.data', 'postgres'), port: config.dbPort, password: config.dbPassword, quiet: true });
if (cluster) await ensureDatabase(cluster, 'plinth');
const handle = createDb(config.databaseUrl ?? cluster!.url('plinth'), { max: 2 });
const files = createFileStore(config.files);
try {
  if (config.medicalDataKey) {
    const report = await rotateMedicalKeyFromEnv({ db: handle.db, files, oldKey: config.medicalDataKey, newKey: newKey! });
    console.log(`${report.values} values and ${report.files} files sealed again under key ${report.keyId}. Set MEDICAL_DATA_KEY to the new key on every process, then start Plinth again.`);
  } else {
    const report = await rotateMedicalKey({ db: handle.db, files, keyFile: config.medicalDataKeyFile, ...(newKey ? { newKey } : {}) });
    console.log(`New medical data key ${report.keyId} in ${config.medicalDataKeyFile}: ${report.values} values and ${report.files} files sealed again. Start Plinth again.`);
  }
} finally {
  files.close();
  await handle.close();
  await cluster?.stop();
}
