import { Migration } from '@mikro-orm/migrations';

/** One project–person link (project_person, with its standing) for the two tables project_member and project_client; rows are copied both ways. */
export class Migration20261202233510 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`project_person\` (\`id\` varchar(36) not null, \`project_id\` varchar(36) not null, \`user_id\` varchar(36) not null, \`standing\` varchar(10) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`project_person\` add index \`project_person_project_id_index\`(\`project_id\`);`);
    this.addSql(`alter table \`project_person\` add index \`project_person_user_id_index\`(\`user_id\`);`);
    this.addSql(`alter table \`project_person\` add unique \`project_person_project_id_user_id_standing_unique\`(\`project_id\`, \`user_id\`, \`standing\`);`);

    this.addSql(`alter table \`project_person\` add constraint \`project_person_project_id_foreign\` foreign key (\`project_id\`) references \`project\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`project_person\` add constraint \`project_person_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);

    // The links people made are kept: copied before the old tables go.
    this.addSql(`insert into \`project_person\` (\`id\`, \`project_id\`, \`user_id\`, \`standing\`) select \`id\`, \`project_id\`, \`user_id\`, 'team' from \`project_member\`;`);
    this.addSql(`insert into \`project_person\` (\`id\`, \`project_id\`, \`user_id\`, \`standing\`) select \`id\`, \`project_id\`, \`user_id\`, 'client' from \`project_client\`;`);

    this.addSql(`drop table if exists \`project_client\`;`);

    this.addSql(`drop table if exists \`project_member\`;`);
  }

  override async down(): Promise<void> {
    this.addSql(`create table \`project_client\` (\`id\` varchar(36) not null, \`project_id\` varchar(36) not null, \`user_id\` varchar(36) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`project_client\` add index \`project_client_project_id_index\`(\`project_id\`);`);
    this.addSql(`alter table \`project_client\` add unique \`project_client_project_id_user_id_unique\`(\`project_id\`, \`user_id\`);`);
    this.addSql(`alter table \`project_client\` add index \`project_client_user_id_index\`(\`user_id\`);`);

    this.addSql(`create table \`project_member\` (\`id\` varchar(36) not null, \`project_id\` varchar(36) not null, \`user_id\` varchar(36) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`project_member\` add index \`project_member_project_id_index\`(\`project_id\`);`);
    this.addSql(`alter table \`project_member\` add unique \`project_member_project_id_user_id_unique\`(\`project_id\`, \`user_id\`);`);
    this.addSql(`alter table \`project_member\` add index \`project_member_user_id_index\`(\`user_id\`);`);

    this.addSql(`alter table \`project_client\` add constraint \`project_client_project_id_foreign\` foreign key (\`project_id\`) references \`project\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`project_client\` add constraint \`project_client_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);

    this.addSql(`alter table \`project_member\` add constraint \`project_member_project_id_foreign\` foreign key (\`project_id\`) references \`project\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`project_member\` add constraint \`project_member_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);

    this.addSql(`insert into \`project_member\` (\`id\`, \`project_id\`, \`user_id\`) select \`id\`, \`project_id\`, \`user_id\` from \`project_person\` where \`standing\` = 'team';`);
    this.addSql(`insert into \`project_client\` (\`id\`, \`project_id\`, \`user_id\`) select \`id\`, \`project_id\`, \`user_id\` from \`project_person\` where \`standing\` = 'client';`);

    this.addSql(`drop table if exists \`project_person\`;`);
  }

}
