import type { DesignSummary } from '../analyticResults';
import type { ModelParameters } from '../modelParameters';

/**
 * The design summary of two existing groups (the original model): the groups
 * were formed before the study by some process nobody wrote down, so the
 * model takes the observed pretest gap as a gap in true scores.
 * @example existingGroupsSummary(m).kind // 'existing-groups'
 */
export function existingGroupsSummary(m: ModelParameters): DesignSummary {
  return {
    kind: 'existing-groups',
    shape: 'two-groups',
    rule: 'The programme and comparison groups already existed; no written rule decided who took part.',
    meaning:
      m.pretestGap === 0
        ? 'The groups start level on the pretest, so matching or adjusting on it adds no regression artefact.'
        : 'The groups differ on the pretest, and the model takes that as a difference in true scores: matching or adjusting on the fallible pretest leaves part of it in place.',
    selectedShare: null,
    noProgrammeChange: null,
  };
}
