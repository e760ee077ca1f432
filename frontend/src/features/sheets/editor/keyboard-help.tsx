/** The keyboard help: every key of the sheet (keyboard.ts), as this computer names it. */
import { Button, Dialog, DialogActions, DialogContent, DialogTitle, Table, TableBody, TableCell, TableRow, Typography } from '@mui/material';
import { keyLabel, KEYBOARD } from './keyboard';

export function KeyboardHelp({ open, onClose }: { open: boolean; onClose: () => void }) {
  return (
    <Dialog open={open} onClose={onClose} aria-labelledby="keyboard-help-title">
      <DialogTitle id="keyboard-help-title">Keys of the sheet</DialogTitle>
      <DialogContent>
        <Typography variant="body2" color="text.secondary" sx={{ mb: 1 }}>
          Cells are saved and evaluated by themselves as you type; these keys only do it sooner, or without the mouse.
        </Typography>
        <Table size="small" aria-label="Keys">
          <TableBody>
            {KEYBOARD.map((k) => (
              <TableRow key={k.command}>
                <TableCell component="th" scope="row" sx={{ whiteSpace: 'nowrap' }}>
                  <kbd>{keyLabel(k.key)}</kbd>
                </TableCell>
                <TableCell>{k.does}</TableCell>
              </TableRow>
            ))}
          </TableBody>
        </Table>
      </DialogContent>
      <DialogActions>
        <Button onClick={onClose}>Close</Button>
      </DialogActions>
    </Dialog>
  );
}
