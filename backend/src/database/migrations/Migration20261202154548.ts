import { Migration } from '@mikro-orm/migrations';

export class Migration20261202154548 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`mail_job\` (\`id\` varchar(36) not null, \`recipients\` json not null, \`subject\` varchar(300) not null, \`text\` text not null, \`html\` text not null, \`status\` varchar(10) not null default 'queued', \`attempts\` int not null default 0, \`next_attempt_at\` datetime(3) not null, \`claim_token\` varchar(36) null, \`claimed_until\` datetime(3) null, \`last_error\` varchar(500) null, \`created_at\` datetime(3) not null, \`sent_at\` datetime(3) null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`mail_job\` add index \`mail_job_status_next_attempt_at_index\`(\`status\`, \`next_attempt_at\`);`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`mail_job\`;`);
  }

}
