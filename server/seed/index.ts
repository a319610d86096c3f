/**
 * The demo data seeded into an empty database, so that a newcomer sees every
 * surface within a minute: accounts for each role, the Serrin Strait scenario,
 * a finished exercise with moves and observer notes, a report draft, and a
 * live exercise ready to play. All people, states and places are invented.
 */
import { seedAccounts } from './accounts';
import { seedExercises } from './exercises';
import { seedReports } from './reports';
import { seedScenario } from './scenario';

export async function seedDemo(): Promise<void> {
  const people = await seedAccounts();
  const scenario = seedScenario(people);
  const exercises = await seedExercises(people, scenario);
  await seedReports(people, exercises);
}
