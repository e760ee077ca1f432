import { Alert, Button, TextField } from '@mui/material';
import { FormCard } from '../components/forms/form-card';
import { useForm } from '../components/forms/use-form';
import { MIN_PASSWORD_LENGTH, registerSchema, useRegister } from '../features/auth';

export function RegisterPage() {
  const form = useForm(registerSchema, { firmName: '', name: '', email: '', password: '' });
  const register = useRegister();
  const submit = () => {
    const body = form.validate();
    if (body) register.mutate(body, { onError: form.showError });
  };
  if (register.isSuccess)
    return (
      <Alert severity="success" role="status">
        {register.data.message}
      </Alert>
    );
  const field = (key: 'firmName' | 'name' | 'email' | 'password', label: string, props: Record<string, unknown> = {}) => (
    <TextField
      label={label}
      value={form.values[key]}
      onChange={(e) => form.set(key, e.target.value)}
      error={!!form.errors[key]}
      helperText={form.errors[key] ?? props.helperText}
      required
      {...props}
    />
  );
  return (
    <FormCard
      page
      title="Register your firm"
      intro="You become the firm's owner: you invite engineers, checkers, approvers and clients."
      error={form.formError}
      onSubmit={submit}
      actions={
        <Button type="submit" variant="contained" disabled={register.isPending}>
          Register
        </Button>
      }
    >
      {field('firmName', 'Firm name', { autoFocus: true, autoComplete: 'organization' })}
      {field('name', 'Your name', { autoComplete: 'name' })}
      {field('email', 'E-mail address', { type: 'email', autoComplete: 'email' })}
      {field('password', 'Password', {
        type: 'password',
        autoComplete: 'new-password',
        helperText: form.errors.password || `At least ${MIN_PASSWORD_LENGTH} characters`,
      })}
    </FormCard>
  );
}
