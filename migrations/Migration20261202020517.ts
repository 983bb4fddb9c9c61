import { Migration } from '@mikro-orm/migrations';

export class Migration20261202020517 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "bee_taxon" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "scientific_name" varchar(200) not null, "scientific_name_authorship" varchar(200) not null default '', "subgenus" varchar(100) not null, "vernacular_names" text[] not null default '{}', "sensitive" boolean not null default false, "sensitivity_note" text not null default '');`);
    this.addSql(`alter table "bee_taxon" add constraint "bee_taxon_scientific_name_unique" unique ("scientific_name");`);

    this.addSql(`create table "plant_taxon" ("id" serial primary key, "created_at" timestamptz not null, "updated_at" timestamptz not null, "scientific_name" varchar(200) not null, "scientific_name_authorship" varchar(200) not null default '', "family" varchar(100) not null, "genus" varchar(100) not null, "taxon_rank" text check ("taxon_rank" in ('species', 'subspecies', 'variety')) not null, "vernacular_names" text[] not null default '{}', "synonyms" text[] not null default '{}', "regional_status" text check ("regional_status" in ('native', 'introduced', 'invasive')) not null, "growth_form" text check ("growth_form" in ('tree', 'shrub', 'forb', 'graminoid', 'vine')) not null, "bloom_start" smallint not null, "bloom_end" smallint not null, "source_note" text not null default '', constraint plant_taxon_bloom_months_check check (bloom_start between 1 and 12 and bloom_end between 1 and 12 and bloom_start <= bloom_end));`);
    this.addSql(`alter table "plant_taxon" add constraint "plant_taxon_scientific_name_unique" unique ("scientific_name");`);
    this.addSql(`create index "plant_taxon_family_index" on "plant_taxon" ("family");`);
  }

}
