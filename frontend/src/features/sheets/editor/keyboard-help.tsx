/** The keyboard help: every key of the sheet (keyboard.ts), as this computer names it, and the keys of a table's grid. */
import { Button, Dialog, DialogActions, DialogContent, DialogTitle, Table, TableBody, TableCell, TableRow, Typography } from '@mui/material';
import { keyLabel, KEYBOARD, TABLE_KEYS } from './keyboard';

function KeyTable({ label, keys }: { label: string; keys: { keys: string; does: string }[] }) {
  return (
    <Table size="small" aria-label={label}>
      <TableBody>
        {keys.map((k) => (
          <TableRow key={k.keys}>
            <TableCell component="th" scope="row" sx={{ whiteSpace: 'nowrap' }}>
              <kbd>{k.keys}</kbd>
            </TableCell>
            <TableCell>{k.does}</TableCell>
          </TableRow>
        ))}
      </TableBody>
    </Table>
  );
}

export function KeyboardHelp({ open, onClose }: { open: boolean; onClose: () => void }) {
  return (
    <Dialog open={open} onClose={onClose} aria-labelledby="keyboard-help-title">
      <DialogTitle id="keyboard-help-title">Keys of the sheet</DialogTitle>
      <DialogContent>
        <Typography variant="body2" color="text.secondary" sx={{ mb: 1 }}>
          Cells are saved and evaluated by themselves as you type; these keys only do it sooner, or without the mouse.
        </Typography>
        <KeyTable label="Keys" keys={KEYBOARD.map((k) => ({ keys: keyLabel(k.key), does: k.does }))} />
        <Typography variant="h3" sx={{ fontSize: '1rem', mt: 2, mb: 0.5 }}>
          In a table
        </Typography>
        <KeyTable label="Keys in a table" keys={[...TABLE_KEYS]} />
      </DialogContent>
      <DialogActions>
        <Button onClick={onClose}>Close</Button>
      </DialogActions>
    </Dialog>
  );
}
