-- Custom migration (hand SQL): fills the accuracy roll-up from the batches saved before it existed.
-- The same statement as rebuildAccuracyDaysSql() in hub/src/batches/batch-desk.repository.ts.
insert into "accuracy_days"
  (kind, group_id, day, group_name, n, go, rescues, sum_dev, sum_sq, max_abs, hist)
select kind, group_id, day, max(group_name), count(*)::int,
  (count(*) filter (where verdict = 'GO'))::int, (count(*) filter (where rescued))::int,
  sum(dev), sum(dev * dev), max(abs(dev)), array[count(*) filter (where bin = 1)::int, count(*) filter (where bin = 2)::int, count(*) filter (where bin = 3)::int, count(*) filter (where bin = 4)::int, count(*) filter (where bin = 5)::int, count(*) filter (where bin = 6)::int, count(*) filter (where bin = 7)::int, count(*) filter (where bin = 8)::int, count(*) filter (where bin = 9)::int, count(*) filter (where bin = 10)::int, count(*) filter (where bin = 11)::int, count(*) filter (where bin = 12)::int, count(*) filter (where bin = 13)::int, count(*) filter (where bin = 14)::int, count(*) filter (where bin = 15)::int, count(*) filter (where bin = 16)::int, count(*) filter (where bin = 17)::int, count(*) filter (where bin = 18)::int, count(*) filter (where bin = 19)::int, count(*) filter (where bin = 20)::int, count(*) filter (where bin = 21)::int, count(*) filter (where bin = 22)::int, count(*) filter (where bin = 23)::int, count(*) filter (where bin = 24)::int, count(*) filter (where bin = 25)::int, count(*) filter (where bin = 26)::int, count(*) filter (where bin = 27)::int, count(*) filter (where bin = 28)::int, count(*) filter (where bin = 29)::int, count(*) filter (where bin = 30)::int, count(*) filter (where bin = 31)::int, count(*) filter (where bin = 32)::int, count(*) filter (where bin = 33)::int, count(*) filter (where bin = 34)::int, count(*) filter (where bin = 35)::int, count(*) filter (where bin = 36)::int, count(*) filter (where bin = 37)::int, count(*) filter (where bin = 38)::int, count(*) filter (where bin = 39)::int, count(*) filter (where bin = 40)::int, count(*) filter (where bin = 41)::int, count(*) filter (where bin = 42)::int, count(*) filter (where bin = 43)::int, count(*) filter (where bin = 44)::int, count(*) filter (where bin = 45)::int, count(*) filter (where bin = 46)::int, count(*) filter (where bin = 47)::int, count(*) filter (where bin = 48)::int, count(*) filter (where bin = 49)::int, count(*) filter (where bin = 50)::int, count(*) filter (where bin = 51)::int, count(*) filter (where bin = 52)::int, count(*) filter (where bin = 53)::int, count(*) filter (where bin = 54)::int, count(*) filter (where bin = 55)::int, count(*) filter (where bin = 56)::int, count(*) filter (where bin = 57)::int, count(*) filter (where bin = 58)::int, count(*) filter (where bin = 59)::int, count(*) filter (where bin = 60)::int, count(*) filter (where bin = 61)::int]
from (
  select g.kind, g.group_id, g.group_name, "batches"."verdict" as verdict,
    coalesce("batches"."ratio_deviation_pct", 0) as dev,
    jsonb_exists("batches"."detail"->'steps', 'rescueTaken') as rescued,
    date_trunc('day', "batches"."created_at", 'UTC') as day,
    least(floor(abs(coalesce("batches"."ratio_deviation_pct", 0)) * 20)::int, 60) + 1 as bin
  from "batches"
  cross join lateral (values
    ('material', "batches"."material_id", "batches"."material_name"),
    ('bench', "batches"."bench_id", null),
    ('operator', "batches"."operator_id", "batches"."operator_name")) as g(kind, group_id, group_name)
  where "batches"."state" = 'saved'
) s
group by kind, group_id, day;
