import { createAccount } from '../../src/lib/accounts';
import { DEMO_PASSWORD, DEMO_PEOPLE, type DemoIds, type DemoPerson } from './people';

export async function seedAccounts(): Promise<DemoIds> {
  const ids = {} as DemoIds;
  for (const key of Object.keys(DEMO_PEOPLE) as DemoPerson[]) {
    ids[key] = await createAccount({ ...DEMO_PEOPLE[key], password: DEMO_PASSWORD });
  }
  return ids;
}
