import { Migration } from '@mikro-orm/migrations';

export class Migration20261202000530 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table \`project\` (\`id\` varchar(36) not null, \`firm_id\` varchar(36) not null, \`job_number\` varchar(40) not null, \`title\` varchar(200) not null, \`client_organisation\` varchar(200) not null, \`site\` varchar(200) not null, \`created_by_id\` varchar(36) null, \`created_at\` datetime not null, \`updated_at\` datetime not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`project\` add index \`project_firm_id_index\`(\`firm_id\`);`);
    this.addSql(`alter table \`project\` add index \`project_created_by_id_index\`(\`created_by_id\`);`);
    this.addSql(`alter table \`project\` add unique \`project_firm_id_job_number_unique\`(\`firm_id\`, \`job_number\`);`);

    this.addSql(`create table \`sheet\` (\`id\` varchar(36) not null, \`project_id\` varchar(36) not null, \`number\` varchar(40) not null, \`title\` varchar(200) not null, \`settings\` json not null, \`extra\` json not null, \`state\` varchar(20) not null default 'being-prepared', \`preparer_id\` varchar(36) not null, \`checker_id\` varchar(36) null, \`approver_id\` varchar(36) null, \`version\` int not null default 1, \`engine_version\` varchar(20) null, \`created_at\` datetime not null, \`updated_at\` datetime not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`sheet\` add index \`sheet_project_id_index\`(\`project_id\`);`);
    this.addSql(`alter table \`sheet\` add index \`sheet_preparer_id_index\`(\`preparer_id\`);`);
    this.addSql(`alter table \`sheet\` add index \`sheet_checker_id_index\`(\`checker_id\`);`);
    this.addSql(`alter table \`sheet\` add index \`sheet_approver_id_index\`(\`approver_id\`);`);
    this.addSql(`alter table \`sheet\` add unique \`sheet_project_id_number_unique\`(\`project_id\`, \`number\`);`);

    this.addSql(`create table \`project_client\` (\`id\` varchar(36) not null, \`project_id\` varchar(36) not null, \`user_id\` varchar(36) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`project_client\` add index \`project_client_project_id_index\`(\`project_id\`);`);
    this.addSql(`alter table \`project_client\` add index \`project_client_user_id_index\`(\`user_id\`);`);
    this.addSql(`alter table \`project_client\` add unique \`project_client_project_id_user_id_unique\`(\`project_id\`, \`user_id\`);`);

    this.addSql(`create table \`cell\` (\`id\` varchar(36) not null, \`sheet_id\` varchar(36) not null, \`position\` int not null, \`kind\` varchar(20) not null, \`fields\` json not null, \`results\` json null, \`changed_by_id\` varchar(36) null, \`changed_at\` datetime(3) not null, primary key (\`id\`)) default character set utf8mb4 engine = InnoDB;`);
    this.addSql(`alter table \`cell\` add index \`cell_sheet_id_index\`(\`sheet_id\`);`);
    this.addSql(`alter table \`cell\` add index \`cell_changed_by_id_index\`(\`changed_by_id\`);`);
    this.addSql(`alter table \`cell\` add index \`cell_sheet_id_position_index\`(\`sheet_id\`, \`position\`);`);

    this.addSql(`alter table \`project\` add constraint \`project_firm_id_foreign\` foreign key (\`firm_id\`) references \`firm\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`project\` add constraint \`project_created_by_id_foreign\` foreign key (\`created_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete set null;`);

    this.addSql(`alter table \`sheet\` add constraint \`sheet_project_id_foreign\` foreign key (\`project_id\`) references \`project\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`sheet\` add constraint \`sheet_preparer_id_foreign\` foreign key (\`preparer_id\`) references \`app_user\` (\`id\`) on update cascade on delete restrict;`);
    this.addSql(`alter table \`sheet\` add constraint \`sheet_checker_id_foreign\` foreign key (\`checker_id\`) references \`app_user\` (\`id\`) on update cascade on delete set null;`);
    this.addSql(`alter table \`sheet\` add constraint \`sheet_approver_id_foreign\` foreign key (\`approver_id\`) references \`app_user\` (\`id\`) on update cascade on delete set null;`);

    this.addSql(`alter table \`project_client\` add constraint \`project_client_project_id_foreign\` foreign key (\`project_id\`) references \`project\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`project_client\` add constraint \`project_client_user_id_foreign\` foreign key (\`user_id\`) references \`app_user\` (\`id\`) on update cascade on delete cascade;`);

    this.addSql(`alter table \`cell\` add constraint \`cell_sheet_id_foreign\` foreign key (\`sheet_id\`) references \`sheet\` (\`id\`) on update cascade on delete cascade;`);
    this.addSql(`alter table \`cell\` add constraint \`cell_changed_by_id_foreign\` foreign key (\`changed_by_id\`) references \`app_user\` (\`id\`) on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table \`sheet\` drop foreign key \`sheet_project_id_foreign\`;`);

    this.addSql(`alter table \`project_client\` drop foreign key \`project_client_project_id_foreign\`;`);

    this.addSql(`alter table \`cell\` drop foreign key \`cell_sheet_id_foreign\`;`);

    this.addSql(`drop table if exists \`project\`;`);

    this.addSql(`drop table if exists \`sheet\`;`);

    this.addSql(`drop table if exists \`project_client\`;`);

    this.addSql(`drop table if exists \`cell\`;`);
  }

}
