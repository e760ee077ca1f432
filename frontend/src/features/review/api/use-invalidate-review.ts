import { useQueryClient } from '@tanstack/react-query';
import { projectKeys } from '../../projects';
import { sheetKeys } from '../../sheets';
import { reviewKeys } from './review-keys';

/** After any review action: the sheet, its queries, revisions and history, and the lists that count them. */
export function useInvalidateReview(sheetId: string) {
  const qc = useQueryClient();
  return () => {
    void qc.invalidateQueries({ queryKey: sheetKeys.one(sheetId) }); // and everything under it: queries, revisions, history
    void qc.invalidateQueries({ queryKey: projectKeys.all });
    void qc.invalidateQueries({ queryKey: reviewKeys.notifications });
  };
}
