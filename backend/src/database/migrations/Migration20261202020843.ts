import { Migration } from '@mikro-orm/migrations';

export class Migration20261202020843 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`firm_certificate\` (\`id\` varchar(36) not null, \`firm_id\` varchar(36) not null, \`p12\` blob not null, \`password_sealed\` text not null, \`subject\` varchar(500) not null, \`issuer\` varchar(500) not null, \`not_before\` datetime not null, \`not_after\` datetime not null, \`fingerprint\` varchar(64) not null, \`self_signed\` tinyint(1) not null, \`updated_at\` datetime(3) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`firm_certificate\` add index \`firm_certificate_firm_id_index\`(\`firm_id\`);`);
    this.addSql(`alter table \`firm_certificate\` add unique \`firm_certificate_firm_id_unique\`(\`firm_id\`);`);

    this.addSql(`create table \`package_job\` (\`id\` varchar(36) not null, \`revision_id\` varchar(36) not null, \`status\` varchar(10) not null default 'queued', \`percent\` int not null default 0, \`attempts\` int not null default 0, \`error\` varchar(500) null, \`locked_by\` varchar(64) null, \`locked_at\` datetime(3) null, \`created_at\` datetime(3) not null, \`updated_at\` datetime(3) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`package_job\` add index \`package_job_revision_id_index\`(\`revision_id\`);`);
    this.addSql(`alter table \`package_job\` add unique \`package_job_revision_id_unique\`(\`revision_id\`);`);
    this.addSql(`alter table \`package_job\` add index \`package_job_status_created_at_index\`(\`status\`, \`created_at\`);`);

    this.addSql(`alter table \`firm_certificate\` add constraint \`firm_certificate_firm_id_foreign\` foreign key (\`firm_id\`) references \`firm\` (\`id\`) on update cascade on delete cascade;`);

    this.addSql(`alter table \`package_job\` add constraint \`package_job_revision_id_foreign\` foreign key (\`revision_id\`) references \`revision\` (\`id\`) on update cascade on delete cascade;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists \`firm_certificate\`;`);

    this.addSql(`drop table if exists \`package_job\`;`);
  }

}
