import { Migration } from '@mikro-orm/migrations';

export class Migration20261201235136 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`audit_event\` (\`id\` varchar(36) not null, \`type\` varchar(40) not null, \`firm_id\` varchar(36) null, \`user_id\` varchar(36) null, \`email\` varchar(254) null, \`detail\` json null, \`ip\` varchar(64) null, \`created_at\` datetime(3) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`audit_event\` add index \`audit_event_firm_id_created_at_index\`(\`firm_id\`, \`created_at\`);`);

    this.addSql(`create table \`app_user\` (\`id\` varchar(36) not null, \`email\` varchar(254) not null, \`name\` varchar(200) not null, \`password_hash\` varchar(100) not null, \`created_at\` datetime not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`app_user\` add unique \`app_user_email_unique\`(\`email\`);`);

    this.addSql(`create table \`session\` (\`token_hash\` varchar(64) not null, \`user_id\` varchar(36) not null, \`firm_id\` varchar(36) not null, \`csrf_token\` varchar(64) not null, \`created_at\` datetime not null, \`expires_at\` datetime not null, primary key (\`token_hash\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`session\` add index \`session_user_id_index\`(\`user_id\`);`);
    this.addSql(`alter table \`session\` add index \`session_firm_id_index\`(\`firm_id\`);`);

    this.addSql(`create table \`password_reset\` (\`token_hash\` varchar(64) not null, \`user_id\` varchar(36) not null, \`expires_at\` datetime not null, \`used_at\` datetime null, \`created_at\` datetime not null, primary key (\`token_hash\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`password_reset\` add index \`password_reset_user_id_index\`(\`user_id\`);`);

    this.addSql(`create table \`membership\` (\`id\` varchar(36) not null, \`firm_id\` varchar(36) not null, \`user_id\` varchar(36) not null, \`roles\` json not null, \`created_at\` datetime not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`membership\` add index \`membership_firm_id_index\`(\`firm_id\`);`);
    this.addSql(`alter table \`membership\` add index \`membership_user_id_index\`(\`user_id\`);`);
    this.addSql(`alter table \`membership\` add unique \`membership_firm_id_user_id_unique\`(\`firm_id\`, \`user_id\`);`);

    this.addSql(`create table \`invitation\` (\`id\` varchar(36) not null, \`firm_id\` varchar(36) not null, \`email\` varchar(254) not null, \`roles\` json not null, \`project_ids\` json not null, \`token_hash\` varchar(64) not null, \`invited_by_id\` varchar(36) null, \`expires_at\` datetime not null, \`accepted_at\` datetime null, \`created_at\` datetime not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`invitation\` add index \`invitation_firm_id_index\`(\`firm_id\`);`);
    this.addSql(`alter table \`invitation\` add unique \`invitation_token_hash_unique\`(\`token_hash\`);`);
    this.addSql(`alter table \`invitation\` add index \`invitation_invited_by_id_index\`(\`invited_by_id\`);`);

    this.addSql(`alter table \`session\` add constraint \`session_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`session\` add constraint \`session_firm_id_foreign\` foreign key (\`firm_id\`) references \`firm\` (\`id\`) on update cascade on delete cascade;`);

    this.addSql(`alter table \`password_reset\` add constraint \`password_reset_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);

    this.addSql(`alter table \`membership\` add constraint \`membership_firm_id_foreign\` foreign key (\`firm_id\`) references \`firm\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`membership\` add constraint \`membership_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);

    this.addSql(`alter table \`invitation\` add constraint \`invitation_firm_id_foreign\` foreign key (\`firm_id\`) references \`firm\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`invitation\` add constraint \`invitation_invited_by_id_foreign\` foreign key (\`invited_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table \`session\` drop foreign key \`session_user_id_foreign\`;`);

    this.addSql(`alter table \`password_reset\` drop foreign key \`password_reset_user_id_foreign\`;`);

    this.addSql(`alter table \`membership\` drop foreign key \`membership_user_id_foreign\`;`);

    this.addSql(`alter table \`invitation\` drop foreign key \`invitation_invited_by_id_foreign\`;`);

    this.addSql(`drop table if exists \`audit_event\`;`);

    this.addSql(`drop table if exists \`app_user\`;`);

    this.addSql(`drop table if exists \`session\`;`);

    this.addSql(`drop table if exists \`password_reset\`;`);

    this.addSql(`drop table if exists \`membership\`;`);

    this.addSql(`drop table if exists \`invitation\`;`);
  }

}
