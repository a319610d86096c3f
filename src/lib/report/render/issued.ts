/** What every export of an issued version carries besides the document itself. */
import type { JSONContent } from '../schema';

export type IssuedReport = {
  title: string;
  exerciseTitle: string;
  number: number;
  issuedAt: Date;
  issuedByName: string;
  content: JSONContent;
};

export const EXERCISE_MARKING = 'EXERCISE · EXERCISE · EXERCISE';

export const CAUTION =
  'EXERCISE material. The analysis in this report follows from the payoffs assumed in the scenario: it is an aid to discussion, not a prediction of what any government will do. Handle it under the sponsor’s own rules for sensitive material.';

export function issuedLine(report: IssuedReport): string {
  const date = report.issuedAt.toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
  return `After-action report · ${report.exerciseTitle} · version ${report.number}, issued ${date} by ${report.issuedByName}`;
}
