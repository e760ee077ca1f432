import { Alert } from '@mui/material';
import { CAUTION_TEXT } from '@ampwright/common/api/cautions';

/** The notice every calculation view carries (PRODUCT.md, Cautions). */
export function CautionNotice() {
  return (
    <Alert severity="warning" variant="outlined" sx={{ mt: 3 }} role="note" aria-label="Caution">
      {CAUTION_TEXT}
    </Alert>
  );
}
