import type { ProgramCompletion } from '@spincycle/shared/night-plans/night-plans';
import { formatDay } from '../../../ui/time/date-format';

/**
 * Why a program is complete, as the end of a sentence ("Complete because …"): "every target has
 * the visit nights its plan needs", "the campaign ended on 15 Apr 2027" (the day as the `day`
 * pipe writes it).
 */
export function completionReason(completion: ProgramCompletion, locale: string): string {
  if (completion.cause === 'visits_done') return 'every target has the visit nights its plan needs';
  return completion.campaignEnd ? `the campaign ended on ${formatDay(completion.campaignEnd, locale)}` : 'the campaign ended';
}
