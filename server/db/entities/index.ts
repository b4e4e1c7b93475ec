import { CapturedMail } from './CapturedMail';
import { GroupMembership } from './GroupMembership';
import { PasswordResetToken } from './PasswordResetToken';
import { ResearchGroup } from './ResearchGroup';
import { Session } from './Session';
import { User } from './User';

export { CapturedMail, GroupMembership, PasswordResetToken, ResearchGroup, Session, User };
export const entities = [User, Session, ResearchGroup, GroupMembership, PasswordResetToken, CapturedMail];
