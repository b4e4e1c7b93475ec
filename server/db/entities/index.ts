import { CapturedMail } from './CapturedMail';
import { Comment } from './Comment';
import { Dataset } from './Dataset';
import { Cell } from './Cell';
import { EmailVerificationToken } from './EmailVerificationToken';
import { GroupMembership } from './GroupMembership';
import { JobRun } from './JobRun';
import { Notebook } from './Notebook';
import { NotebookEvent } from './NotebookEvent';
import { NotebookFollow } from './NotebookFollow';
import { NotebookInvitation } from './NotebookInvitation';
import { NotebookMember } from './NotebookMember';
import { NotebookVersion } from './NotebookVersion';
import { NotebookVersionDataset } from './NotebookVersionDataset';
import { Notification } from './Notification';
import { PasswordResetToken } from './PasswordResetToken';
import { ResearchGroup } from './ResearchGroup';
import { ServerSecret } from './ServerSecret';
import { Session } from './Session';
import { ShareLink } from './ShareLink';
import { User } from './User';

export {
  CapturedMail, Cell, Comment, EmailVerificationToken, GroupMembership, JobRun, Notebook, NotebookEvent, NotebookFollow, NotebookInvitation, NotebookMember,
  NotebookVersion, NotebookVersionDataset, Dataset, Notification, PasswordResetToken, ResearchGroup, ServerSecret, Session, ShareLink, User,
};
export const entities = [User, Session, ResearchGroup, GroupMembership, PasswordResetToken, CapturedMail, Notebook, Cell, JobRun, NotebookVersion, EmailVerificationToken, ServerSecret,
  NotebookMember, ShareLink, NotebookInvitation, Comment, NotebookEvent, Notification, NotebookFollow,
  Dataset, NotebookVersionDataset];
