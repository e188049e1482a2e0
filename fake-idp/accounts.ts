/**
 * Invented people for local sign-in. They cover each role Plinth distinguishes, plus one person
 * who has signed up but has not been given access yet, so every permission path can be tried by hand.
 */

export interface DemoAccount {
  /** Stable across restarts so the app's user records keep matching the same person. */
  sub: string;
  email: string;
  name: string;
  password: string;
  description: string;
}

export const DEMO_PASSWORD = 'plinth-demo';

export const demoAccounts: readonly DemoAccount[] = Object.freeze([
  {
    sub: 'demo-admin-0001',
    email: 'admin@plinth.test',
    name: 'Ines Calloway',
    password: DEMO_PASSWORD,
    description: 'Studio administrator',
  },
  {
    sub: 'demo-head-0001',
    email: 'head@plinth.test',
    name: 'Marta Oyelaran',
    password: DEMO_PASSWORD,
    description: 'Department head, The Lantern Keeper; artist on Saltglass Mile',
  },
  {
    sub: 'demo-lead-0001',
    email: 'lead@plinth.test',
    name: 'Dr. Tomasz Brill',
    password: DEMO_PASSWORD,
    description: 'Designated lead, The Lantern Keeper',
  },
  {
    sub: 'demo-artist-0001',
    email: 'artist@plinth.test',
    name: 'Rafe Lindqvist',
    password: DEMO_PASSWORD,
    description: 'Prosthetics artist, The Lantern Keeper',
  },
  {
    sub: 'demo-artist2-0001',
    email: 'artist2@plinth.test',
    name: 'Sol Varga',
    password: DEMO_PASSWORD,
    description: 'Artist on The Lantern Keeper; head on Saltglass Mile',
  },
  {
    sub: 'demo-archivist-0001',
    email: 'archivist@plinth.test',
    name: 'Nell Achterberg',
    password: DEMO_PASSWORD,
    description: 'Archivist, both productions',
  },
  {
    sub: 'demo-performer-0001',
    email: 'performer@plinth.test',
    name: 'Juno Castellane',
    password: DEMO_PASSWORD,
    description: 'Performer (Juno Castellane, The Keeper)',
  },
  {
    sub: 'demo-newcomer-0001',
    email: 'newcomer@plinth.test',
    name: 'Pip Okonkwo-Hale',
    password: DEMO_PASSWORD,
    description: 'Signed up, not yet given access',
  },
].map((account) => Object.freeze(account)));

/** People type their address with whatever capitalisation they like; mail addresses here are all lower case. */
export function findDemoAccount(email: string): DemoAccount | undefined {
  const wanted = email.trim().toLowerCase();
  return demoAccounts.find((account) => account.email === wanted);
}

export function findDemoAccountBySub(sub: string): DemoAccount | undefined {
  return demoAccounts.find((account) => account.sub === sub);
}
