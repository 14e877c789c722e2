import fs from 'node:fs';
import type { Role } from '../../shared/schemas/enums.js';

interface ScenarioUsers {
  companies: { key: string; name: string; users: { email: string; role: Role; password: string }[] }[];
}

const scenario = JSON.parse(fs.readFileSync(new URL('../../data/demo/scenario.json', import.meta.url), 'utf8')) as ScenarioUsers;

/** The main demo company's sign-in for a role. */
export function demoUser(role: Role): string {
  const user = scenario.companies[0].users.find((u) => u.role === role);
  if (!user) throw new Error(`the demo company has no ${role}`);
  return user.email;
}

/** A user of the second (small) demo company, for tenant-isolation checks. */
export function otherCompanyUser(role: Role = 'admin'): string {
  const user = scenario.companies[1].users.find((u) => u.role === role);
  if (!user) throw new Error(`the second demo company has no ${role}`);
  return user.email;
}

export const demoCompanyName = () => scenario.companies[0].name;
