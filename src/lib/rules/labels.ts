// How sure we are of a trade value: the labels of docs/references.md. Each value the rules
// core holds names its source and label beside it; reference-values.ts gathers them and
// tests/lib/rules/reference-labels.test.ts holds them to docs/references.md.

/**
 * - seen: read in the published or secondary source named;
 * - seen (secondary): read in a summary or table that quotes the source named;
 * - partly: the source was seen, but the value only in part or second-hand;
 * - memory: the team's knowledge, not checked against a source here;
 * - practice: taught as common practice, no published source;
 * - computed: arithmetic on a method above;
 * - judgement: our own decision on how to use a value, not a fact about teeth.
 */
export type SourceLabel = 'seen' | 'seen (secondary)' | 'partly' | 'memory' | 'practice' | 'computed' | 'judgement';

/** What each label means, in the words of docs/references.md's "Labels" list. */
export const LABEL_MEANINGS: Readonly<Record<SourceLabel, string>> = Object.freeze({
  seen: 'the value was read in a published or secondary source named here',
  'seen (secondary)': 'read in a summary or table quoting the source named',
  partly: 'the source was seen, but the value only in part or second-hand',
  memory: "from the team's knowledge, not yet checked against a source here",
  practice: 'a fact of the trade taught as common practice, with no published source',
  computed: 'arithmetic on a method above (the worked examples the tests hold)',
  judgement: 'our own decision on how to use a value, not a fact about teeth',
});

export const SOURCE_LABELS: readonly SourceLabel[] = [
  'seen',
  'seen (secondary)',
  'partly',
  'memory',
  'practice',
  'computed',
  'judgement',
];

/** Where a value comes from and how sure we are of it. */
export interface Sourced {
  source: string;
  label: SourceLabel;
}

/** The source written for a value from the team's knowledge with no publication to name. */
export const TEAM_KNOWLEDGE = "team's knowledge";
/** The source written for a value taught as common practice. */
export const TRADE_TEACHING = 'trade teaching';
/** The source written for our own decisions. */
export const CONELINE = 'Coneline';

/** One trade value as docs/references.md's "Values in the code" table lists it. */
export interface LabelledValue extends Sourced {
  /** Stable id, the first cell of the row, e.g. "averageLength.maxillary.3". */
  id: string;
  /** What it is, in words (the second cell). */
  what: string;
  /** The value as the table writes it, e.g. "27 mm" (the third cell). */
  value: string;
}
