import { existsSync, readFileSync } from 'node:fs';
import type { Config } from '../config.ts';
import { installKeyring, keyringOf, loadOrCreateKeyFile } from './medical.ts';

/** The previous keys kept while a rotation is under way: one per line, beside the key file. */
export function previousKeyFile(keyFile: string): string {
  return `${keyFile}.previous`;
}

/**
 * Installs the keys health details are sealed with: MEDICAL_DATA_KEY, or the key file (created
 * with mode 0600 on a development machine's first start; never created in production).
 */
export function installMedicalKeys(config: Config): void {
  const current = config.medicalDataKey ?? loadOrCreateKeyFile(config.medicalDataKeyFile, !config.isProduction);
  if (!current) {
    throw new Error(`No medical data key: set MEDICAL_DATA_KEY (openssl rand -base64 32) or put the key in ${config.medicalDataKeyFile}.`);
  }
  const prevFile = previousKeyFile(config.medicalDataKeyFile);
  const previous = existsSync(prevFile) ? readFileSync(prevFile, 'utf8').split('\n').map((l) => l.trim()).filter(Boolean) : [];
  installKeyring(keyringOf(current, previous));
}
