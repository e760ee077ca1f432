import { Alert, CircularProgress, Link as MuiLink } from '@mui/material';
import { useEffect, useRef } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { useConfirmRegistration } from '../features/auth';

/** The page the registration e-mail links to: it makes the firm and signs its owner in. */
export function ConfirmRegistrationPage() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const confirm = useConfirmRegistration();
  const sent = useRef(false);
  useEffect(() => {
    if (sent.current) return;
    sent.current = true;
    confirm.mutate(params.get('token') ?? '', { onSuccess: () => navigate('/members', { replace: true }) });
  }, [confirm, navigate, params]);
  if (confirm.isError) {
    return (
      <Alert severity="error">
        {confirm.error.message}{' '}
        <MuiLink component={Link} to="/register">
          Register
        </MuiLink>{' '}
        ·{' '}
        <MuiLink component={Link} to="/sign-in">
          Sign in
        </MuiLink>
      </Alert>
    );
  }
  return <CircularProgress aria-label="Confirming the registration" />;
}
