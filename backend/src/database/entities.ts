import { CellQuery, QueryMessage } from '../review/entities/cell-query.entity';
import { Revision } from '../review/entities/revision.entity';
import { Notification } from '../notifications/entities/notification.entity';
import { FirmCertificate } from '../packages/entities/firm-certificate.entity';
import { PackageJob } from '../packages/entities/package-job.entity';
import { Template } from '../templates/entities/template.entity';
import { Attachment } from '../attachments/entities/attachment.entity';
import { AuditEvent } from '../audit/entities/audit-event.entity';
import { PasswordReset } from '../auth/entities/password-reset.entity';
import { PendingRegistration } from '../auth/entities/pending-registration.entity';
import { Session } from '../auth/entities/session.entity';
import { Firm } from '../firms/entities/firm.entity';
import { Membership } from '../firms/entities/membership.entity';
import { Invitation } from '../invitations/entities/invitation.entity';
import { Project, ProjectPerson } from '../projects/entities/project.entity';
import { Cell } from '../sheets/entities/cell.entity';
import { SheetAuthor } from '../sheets/entities/sheet-author.entity';
import { Sheet } from '../sheets/entities/sheet.entity';
import { User } from '../users/entities/user.entity';
import { ThrottleCounter } from '../core/throttle/throttle-counter.entity';
import { MailJob } from '../mail/entities/mail-job.entity';

/** Every entity, listed once: the ORM, the migrator and the seed read this list. */
export const ENTITIES = [
  Firm,
  User,
  Membership,
  Session,
  PasswordReset,
  Invitation,
  AuditEvent,
  Project,
  ProjectPerson,
  Sheet,
  SheetAuthor,
  Cell,
  Attachment,
  CellQuery,
  QueryMessage,
  Revision,
  Notification,
  FirmCertificate,
  PackageJob,
  Template,
  ThrottleCounter,
  MailJob,
  PendingRegistration,
];
