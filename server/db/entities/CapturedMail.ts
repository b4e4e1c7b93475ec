import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** A message received by the built-in SMTP fake. */
@Entity({ name: 'captured_mail' })
export class CapturedMail {
  @PrimaryGeneratedColumn({ type: 'integer' })
  id: number;

  @Column({ type: 'varchar', length: 500 })
  sender: string;

  @Column({ type: 'varchar', length: 2000 })
  recipients: string;

  @Column({ type: 'varchar', length: 500 })
  subject: string;

  @Column({ type: 'text' })
  textBody: string;

  @Column({ type: 'text', nullable: true })
  htmlBody: string | null;

  @CreateDateColumn({ type: 'datetime' })
  receivedAt: Date;
}
