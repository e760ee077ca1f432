import { Alert } from '@mui/material';

/** The notice every calculation view carries (PRODUCT.md, Cautions). */
export const CAUTION_TEXT =
  'Results are for use by qualified engineers. Check them independently before relying on them; ' +
  'locally adopted electrical codes and licensed practice take precedence, and the engineer of record remains responsible.';

export function CautionNotice() {
  return (
    <Alert severity="warning" variant="outlined" sx={{ mt: 3 }} role="note" aria-label="Caution">
      {CAUTION_TEXT}
    </Alert>
  );
}
