import { createDb } from '../../api/db/index.ts';
import { migrateToLatest } from '../../api/db/migrate.ts';
import { adminUrl, TEMPLATE_DB } from './db.ts';
import pg from 'pg';

/** Migrates one template database; each test file then clones it (fast, isolated). */
export default async function setup(): Promise<void> {
  const admin = new pg.Client({ connectionString: adminUrl() });
  await admin.connect();
  try {
    await admin.query(`drop database if exists ${TEMPLATE_DB} with (force)`);
    await admin.query(`create database ${TEMPLATE_DB}`);
  } finally {
    await admin.end();
  }
  const handle = createDb(adminUrl(TEMPLATE_DB), { max: 1 });
  try {
    await migrateToLatest(handle.db);
  } finally {
    await handle.close();
  }
}
