import { Paper, Typography } from '@mui/material';
import { PageHeading } from '../components/layout/page-heading';

export function ProjectsPage() {
  return (
    <>
      <PageHeading overline="Work">Projects</PageHeading>
      <Paper sx={{ p: 3 }}>
        <Typography color="text.secondary">Projects and their sheets will be listed here.</Typography>
      </Paper>
    </>
  );
}
