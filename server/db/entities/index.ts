import { CapturedMail } from './CapturedMail';
import { Cell } from './Cell';
import { EmailVerificationToken } from './EmailVerificationToken';
import { GroupMembership } from './GroupMembership';
import { JobRun } from './JobRun';
import { Notebook } from './Notebook';
import { NotebookVersion } from './NotebookVersion';
import { PasswordResetToken } from './PasswordResetToken';
import { ResearchGroup } from './ResearchGroup';
import { ServerSecret } from './ServerSecret';
import { Session } from './Session';
import { User } from './User';

export { CapturedMail, Cell, EmailVerificationToken, GroupMembership, JobRun, Notebook, NotebookVersion, PasswordResetToken, ResearchGroup, ServerSecret, Session, User };
export const entities = [User, Session, ResearchGroup, GroupMembership, PasswordResetToken, CapturedMail, Notebook, Cell, JobRun, NotebookVersion, EmailVerificationToken, ServerSecret];
