import { demoAccounts } from '../db/seed/demo-season';

/** The demo season's accounts, as the start banners print them. */
export function printDemoSignIns(): void {
  console.log('Demo sign-ins (Larkhaven Seed Library, season 2026):');
  for (const a of demoAccounts)
    console.log(`  ${a.key.padEnd(12)} ${a.email.padEnd(36)} ${a.password}`);
}
