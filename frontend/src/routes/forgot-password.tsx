import { Alert, Button, TextField } from '@mui/material';
import { FormCard } from '../components/forms/form-card';
import { useForm } from '../components/forms/use-form';
import { forgotSchema, useForgotPassword } from '../features/auth';

export function ForgotPasswordPage() {
  const form = useForm(forgotSchema, { email: '' });
  const forgot = useForgotPassword();
  const submit = () => {
    const body = form.validate();
    if (body) forgot.mutate(body, { onError: form.showError });
  };
  return (
    <FormCard
      page
      title="Reset your password"
      intro="Enter the address you sign in with; we e-mail a link that works once, for an hour."
      error={form.formError}
      onSubmit={submit}
      actions={
        <Button type="submit" variant="contained" disabled={forgot.isPending}>
          Send the link
        </Button>
      }
    >
      <TextField
        label="E-mail address"
        type="email"
        autoComplete="email"
        value={form.values.email}
        onChange={(e) => form.set('email', e.target.value)}
        error={!!form.errors.email}
        helperText={form.errors.email}
        required
        autoFocus
      />
      {forgot.isSuccess && <Alert severity="success">{forgot.data.message}</Alert>}
    </FormCard>
  );
}
