import { Column, CreateDateColumn, Entity, OneToMany, PrimaryColumn } from 'typeorm';
import { GroupMembership } from './GroupMembership';

@Entity({ name: 'research_groups' })
export class ResearchGroup {
  @PrimaryColumn({ type: 'varchar', length: 40 })
  id: string;

  @Column({ type: 'varchar', length: 120 })
  name: string;

  @Column({ type: 'text', default: '' })
  description: string;

  @CreateDateColumn({ type: 'datetime' })
  createdAt: Date;

  @OneToMany(() => GroupMembership, (membership) => membership.group)
  memberships?: GroupMembership[];
}
