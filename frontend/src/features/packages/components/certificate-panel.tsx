/** The owner's view of the firm's signing certificate, and the upload of the firm's own PKCS#12 file. */
import { Alert, Button, FormControlLabel, Paper, Stack, Switch, TextField, Typography } from '@mui/material';
import { useRef, useState } from 'react';
import { monoFont } from '../../../app/theme';
import { useCertificate } from '../api/get-certificate';
import { usePackageSettings } from '../api/get-package-settings';
import { useSetPackageSettings } from '../api/set-package-settings';
import { useUploadCertificate } from '../api/upload-certificate';

/** Whether the firm's packages carry its internal query register: off unless the owner turns it on. */
function QueryRegisterSetting() {
  const settings = usePackageSettings();
  const save = useSetPackageSettings();
  return (
    <Stack sx={{ mt: 2 }}>
      <FormControlLabel
        control={
          <Switch
            checked={settings.data?.queryRegister ?? false}
            disabled={!settings.data || save.isPending}
            onChange={(e) => save.mutate({ queryRegister: e.target.checked })}
          />
        }
        label="Include the query register (the checker's queries and the answers) in packages issued from now on"
      />
      <Typography variant="caption" color="text.secondary">
        Off by default: a client's package shows the checked calculation, not the firm's internal review.
      </Typography>
      {save.isError && <Alert severity="error">{save.error.message}</Alert>}
    </Stack>
  );
}

export function CertificatePanel() {
  const cert = useCertificate();
  const upload = useUploadCertificate();
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [password, setPassword] = useState('');
  const c = cert.data;
  return (
    <Paper component="section" aria-label="Signing certificate" sx={{ p: 2 }}>
      <Typography variant="h4" gutterBottom>
        Signing certificate
      </Typography>
      {c ? (
        <Typography variant="body2">
          {c.subject}; issued by {c.issuer}; valid {c.notBefore.slice(0, 10)} to {c.notAfter.slice(0, 10)}
          {c.selfSigned ? " — self-signed by Ampwright for the demo: upload the firm's own certificate for real issues" : ''}.
          <br />
          <span style={{ fontFamily: monoFont, fontSize: 11, overflowWrap: 'anywhere' }}>SHA-256 {c.fingerprint}</span>
        </Typography>
      ) : (
        <Typography variant="body2" color="text.secondary">
          None yet: the first package the firm issues is signed with a self-signed certificate that Ampwright makes. Upload the firm's own to replace it.
        </Typography>
      )}
      <Stack direction={{ xs: 'column', sm: 'row' }} spacing={1.5} sx={{ mt: 2, alignItems: { sm: 'center' } }}>
        <Button variant="outlined" onClick={() => input.current?.click()}>
          {file ? file.name : 'Choose a .p12 or .pfx file…'}
        </Button>
        <input ref={input} type="file" accept=".p12,.pfx,application/x-pkcs12" hidden onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
        <TextField size="small" type="password" label="Certificate password" value={password} onChange={(e) => setPassword(e.target.value)} />
        <Button
          variant="contained"
          disabled={!file || upload.isPending}
          onClick={() => file && upload.mutate({ file, password }, { onSuccess: () => (setFile(null), setPassword('')) })}
        >
          Upload
        </Button>
      </Stack>
      {upload.isError && (
        <Alert severity="error" sx={{ mt: 1 }}>
          {upload.error.message}
        </Alert>
      )}
      {upload.isSuccess && (
        <Alert severity="success" sx={{ mt: 1 }}>
          The firm's certificate is in place; new packages are signed with it. Its password is kept encrypted.
        </Alert>
      )}
      <QueryRegisterSetting />
    </Paper>
  );
}
