import { Migration } from '@mikro-orm/migrations';

export class Migration20261202054051 extends Migration {

  override async up(): Promise<void> {
    // Site keys become integers (distinct counts sort them; integers sort several times faster
    // than text): a site's id, or a negative number for a 0.01° grid cell. Refiled below.
    this.addSql(`truncate forage_count, forage_month_count, forage_band_month_count;`);
    this.addSql(`alter table "forage_count" alter column "site_key" type bigint using (0);`);
    // A fourth rollup for the commonest ranking, all bumble bees over a season window: without
    // bee and month it has about half the rows of forage_count to count distinct sites over.
    this.addSql(`drop table if exists "forage_presence";`);
    this.addSql(`create table "forage_presence" ("id" bigserial primary key, "caste" varchar(10) not null, "season" varchar(20) not null, "band" varchar(5) not null, "evidence" varchar(10) not null, "year" smallint not null, "plant_taxon_id" int not null, "site_key" bigint not null, "recorder_id" int not null, "visits" int not null);`);
    this.addSql(`alter table "forage_presence" add constraint "forage_presence_key" unique ("caste", "season", "band", "evidence", "year", "plant_taxon_id", "site_key", "recorder_id");`);
    // The matrix filters by caste, band and evidence: lead the month rollup's key with them.
    this.addSql(`alter table "forage_month_count" drop constraint "forage_month_count_key";`);
    this.addSql(`alter table "forage_month_count" add constraint "forage_month_count_key" unique ("caste", "band", "evidence", "season", "year", "month", "bee_taxon_id", "plant_taxon_id");`);
    this.addSql(`drop function forage_site_key(int, double precision, double precision);`);
    this.addSql(`create function forage_site_key(site_id int, latitude double precision, longitude double precision) returns bigint
      language sql immutable parallel safe as $$
        select case when site_id is not null then site_id::bigint
          else -((floor(latitude * 100)::bigint + 9001) * 40000 + (floor(longitude * 100)::bigint + 18001)) end $$;`);
    this.addSql(`create or replace function forage_count_apply(v visit, delta int) returns void language plpgsql as $$
      declare
        b text := forage_band(v.decimal_latitude);
        ev text := forage_evidence(v.plant_status::text, v.bee_status::text);
        k_season text := forage_season(b, v.event_local_date);
        k_site bigint := forage_site_key(v.site_id, v.decimal_latitude, v.decimal_longitude);
        k_year int := extract(year from v.event_local_date)::int;
        k_month int := extract(month from v.event_local_date)::int;
        k_bee int := coalesce(v.bee_taxon_id, 0);
      begin
        if v.plant_taxon_id is null or ev is null then return; end if;
        insert into forage_count (caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, site_key, recorder_id, visits)
        values (v.caste::text, k_season, b, ev, k_year, k_month, k_bee, v.plant_taxon_id, k_site, v.recorder_id, delta)
        on conflict on constraint forage_count_key do update set visits = forage_count.visits + excluded.visits;
        insert into forage_month_count (caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, visits)
        values (v.caste::text, k_season, b, ev, k_year, k_month, k_bee, v.plant_taxon_id, delta)
        on conflict on constraint forage_month_count_key do update set visits = forage_month_count.visits + excluded.visits;
        insert into forage_band_month_count (caste, band, evidence, year, month, visits)
        values (v.caste::text, b, ev, k_year, k_month, delta)
        on conflict on constraint forage_band_month_count_key do update set visits = forage_band_month_count.visits + excluded.visits;
        insert into forage_presence (caste, season, band, evidence, year, plant_taxon_id, site_key, recorder_id, visits)
        values (v.caste::text, k_season, b, ev, k_year, v.plant_taxon_id, k_site, v.recorder_id, delta)
        on conflict on constraint forage_presence_key do update set visits = forage_presence.visits + excluded.visits;
        if delta < 0 then
          delete from forage_count
          where caste = v.caste::text and season = k_season and band = b and evidence = ev and year = k_year and month = k_month
            and bee_taxon_id = k_bee and plant_taxon_id = v.plant_taxon_id and site_key = k_site and recorder_id = v.recorder_id and visits <= 0;
          delete from forage_month_count
          where caste = v.caste::text and season = k_season and band = b and evidence = ev and year = k_year and month = k_month
            and bee_taxon_id = k_bee and plant_taxon_id = v.plant_taxon_id and visits <= 0;
          delete from forage_band_month_count
          where caste = v.caste::text and band = b and evidence = ev and year = k_year and month = k_month and visits <= 0;
          delete from forage_presence
          where caste = v.caste::text and season = k_season and band = b and evidence = ev and year = k_year
            and plant_taxon_id = v.plant_taxon_id and site_key = k_site and recorder_id = v.recorder_id and visits <= 0;
        end if;
      end $$;`);
    this.addSql(`create or replace function forage_count_rebuild() returns void language plpgsql as $$
      begin
        lock table visit in share mode;
        truncate forage_count, forage_month_count, forage_band_month_count, forage_presence;
        insert into forage_count (caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, site_key, recorder_id, visits)
        select f.caste, coalesce(w.name, ''), f.band, f.evidence, f.year, f.month, f.bee, f.plant, f.site_key, f.recorder_id, count(*)
        from (
          select v.caste::text as caste, forage_band(v.decimal_latitude) as band,
                 forage_evidence(v.plant_status::text, v.bee_status::text) as evidence,
                 extract(year from v.event_local_date)::int as year, extract(month from v.event_local_date)::int as month,
                 extract(month from v.event_local_date)::int * 100 + extract(day from v.event_local_date)::int as month_day,
                 coalesce(v.bee_taxon_id, 0) as bee, v.plant_taxon_id as plant,
                 forage_site_key(v.site_id, v.decimal_latitude, v.decimal_longitude) as site_key, v.recorder_id
          from visit v where v.plant_taxon_id is not null
        ) f
        left join season_window w on w.band = f.band and case
          when forage_month_day(w.start) <= forage_month_day(w."end") then f.month_day between forage_month_day(w.start) and forage_month_day(w."end")
          else f.month_day >= forage_month_day(w.start) or f.month_day <= forage_month_day(w."end") end
        where f.evidence is not null
        group by 1, 2, 3, 4, 5, 6, 7, 8, 9, 10
        order by 1, 2, 3, 4, 5, 6, 7, 8, 9, 10;
        insert into forage_month_count (caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, visits)
        select caste, season, band, evidence, year, month, bee_taxon_id, plant_taxon_id, sum(visits)
        from forage_count group by 1, 2, 3, 4, 5, 6, 7, 8 order by 1, 3, 4, 2, 5, 6, 7, 8;
        insert into forage_band_month_count (caste, band, evidence, year, month, visits)
        select caste, band, evidence, year, month, sum(visits) from forage_month_count group by 1, 2, 3, 4, 5 order by 1, 2, 3, 4, 5;
        insert into forage_presence (caste, season, band, evidence, year, plant_taxon_id, site_key, recorder_id, visits)
        select caste, season, band, evidence, year, plant_taxon_id, site_key, recorder_id, sum(visits)
        from forage_count group by 1, 2, 3, 4, 5, 6, 7, 8 order by 1, 2, 3, 4, 5, 6, 7, 8;
      end $$;`);
    this.addSql(`select forage_count_rebuild();`);
  }

  override async down(): Promise<void> {
    // The text keys of the previous migration are not restored; run forage_count_rebuild() after.
    this.addSql(`drop table if exists "forage_presence" cascade;`);
    this.addSql(`alter table "forage_month_count" drop constraint "forage_month_count_key";`);
    this.addSql(`alter table "forage_month_count" add constraint "forage_month_count_key" unique ("caste", "season", "band", "evidence", "year", "month", "bee_taxon_id", "plant_taxon_id");`);
    this.addSql(`truncate forage_count, forage_month_count, forage_band_month_count;`);
    this.addSql(`alter table "forage_count" alter column "site_key" type varchar(24) using ('');`);
  }

}
