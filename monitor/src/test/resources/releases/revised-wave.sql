-- An invented survey published twice: wave w1 came out as release 1 and was then revised as release 2; wave w2 has
-- one release. Everything release 2 changes is spelt out below, so the tests know every count exactly.
-- Two layouts of the same publications:
--   src.pub                     one table, a release column telling the releases apart
--   src.pub_v1 and src.pub_v2   the earlier and the current publication in two tables of the same layout

CREATE SCHEMA IF NOT EXISTS src;

CREATE TABLE src.pub (
    wave          text    NOT NULL,
    release       integer NOT NULL,
    respondent_id integer NOT NULL,
    age           integer,
    region        text,
    hours         numeric(4, 1),
    employed      boolean,
    remark        text,
    weight        double precision
);

INSERT INTO src.pub VALUES
    ('w1', 1, 1, 38, 'south', 34.5, false, 'C:\temp', 1.25),
    ('w1', 1, 2, 55, 'north', 37.2, false, 'none', 0.75),
    ('w1', 1, 3, 34, 'west', 32.1, true, 'ok', 2.0),
    ('w1', 1, 4, 25, 'south', 38.2, true, 'new job', 0.75),
    ('w1', 1, 5, 54, 'north', 40.0, true, 'none', 1.25),
    ('w1', 1, 6, 44, 'south', 37.3, true, 'new job', 1.25),
    ('w1', 1, 7, 53, 'south', 42.2, true, 'ok', 2.0),
    ('w1', 1, 8, 63, 'north', 40.7, true, 'new job', 1.0),
    ('w1', 1, 9, 49, 'west', 37.1, false, E'late\tshift', 1.25),
    ('w1', 1, 10, 33, 'south', 29.4, true, 'none', 0.75),
    ('w1', 1, 11, 54, 'east', 23.9, false, 'busy week', 2.0),
    ('w1', 1, 12, 41, 'north', 34.1, true, 'on leave', 1.0),
    ('w1', 1, 13, 66, 'east', 40.0, true, 'ok', 2.0),
    ('w1', 1, 14, 54, 'east', 41.7, true, 'busy week', 2.0),
    ('w1', 1, 15, 49, 'west', 38.4, true, 'ok', 0.75),
    ('w1', 1, 16, 64, 'east', 37.1, true, 'on leave', 1.25),
    ('w1', 1, 17, 63, 'west', 40.2, false, 'busy week', 1.0),
    ('w1', 1, 18, 57, 'north', 32.4, true, 'none', 1.25),
    ('w1', 1, 19, 26, 'south', 25.3, true, 'none', 1.5),
    ('w1', 1, 20, NULL, 'east', 44.0, false, 'on leave', 2.0),
    ('w1', 1, 21, 35, 'west', 45.1, true, 'none', 1.0),
    ('w1', 1, 22, 23, 'south', 35.2, true, 'none', 0.75),
    ('w1', 1, 23, 49, 'south', 36.0, true, 'busy week', 2.0),
    ('w1', 1, 24, 54, 'east', 36.5, false, 'new job', 2.0),
    ('w2', 1, 1, 59, 'north', 24.3, false, 'new job', 1.5),
    ('w2', 1, 2, 43, 'west', 39.3, true, 'on leave', 1.5),
    ('w2', 1, 3, 21, 'south', 39.7, true, 'busy week', 2.0),
    ('w2', 1, 4, 21, 'north', 37.7, true, 'none', 2.0),
    ('w2', 1, 5, 24, 'east', 34.3, true, 'on leave', 1.0),
    ('w2', 1, 6, 58, 'east', 34.5, false, 'new job', 1.25),
    ('w2', 1, 7, 48, 'north', 41.2, false, 'on leave', 1.5),
    ('w2', 1, 8, 37, 'north', 40.6, true, 'busy week', 1.25),
    ('w2', 1, 9, 48, 'south', 32.0, false, 'busy week', 1.0),
    ('w2', 1, 10, 62, 'north', 35.6, false, 'busy week', 0.75),
    ('w2', 1, 11, 62, 'east', 23.0, true, 'none', 2.0),
    ('w2', 1, 12, 52, 'east', 34.5, true, 'new job', 1.0),
    ('w2', 1, 13, 69, 'south', 40.1, true, 'new job', 1.5),
    ('w2', 1, 14, 40, 'north', 27.0, false, 'busy week', 1.5),
    ('w2', 1, 15, 34, 'south', 30.7, true, 'busy week', 1.25),
    ('w2', 1, 16, 23, 'south', 21.9, true, 'on leave', 1.0),
    ('w2', 1, 17, 39, 'south', 20.0, true, 'ok', 1.5),
    ('w2', 1, 18, 76, 'east', 37.9, false, 'ok', 0.75),
    ('w2', 1, 19, 76, 'west', 38.0, true, 'none', 1.5),
    ('w2', 1, 20, 68, 'east', 26.2, true, 'on leave', 1.5);

-- Release 2 of w1: release 1 republished without respondents 7 and 19 ...
INSERT INTO src.pub
SELECT wave, 2, respondent_id, age, region, hours, employed, remark, weight
FROM src.pub WHERE wave = 'w1' AND release = 1 AND respondent_id NOT IN (7, 19);

-- ... with respondents 25, 26 and 27 added ...
INSERT INTO src.pub VALUES
    ('w1', 2, 25, 31, 'west', 39.5, true, 'ok', 1.0),
    ('w1', 2, 26, 47, 'north', 33.8, false, 'none', 1.25),
    ('w1', 2, 27, 29, 'south', 41.6, true, 'new job', 1.5);

-- ... and these cells changed (22 respondents are in both releases):
-- age: 3 cells (one was NULL); region: 2 (one became NULL); hours: 7; employed: none; remark: 1; weight: 11.
UPDATE src.pub SET age = 35 WHERE wave = 'w1' AND release = 2 AND respondent_id = 3;      -- 34 -> 35
UPDATE src.pub SET age = 14 WHERE wave = 'w1' AND release = 2 AND respondent_id = 12;     -- 41 -> 14
UPDATE src.pub SET age = 52 WHERE wave = 'w1' AND release = 2 AND respondent_id = 20;     -- NULL -> 52
UPDATE src.pub SET region = 'south' WHERE wave = 'w1' AND release = 2 AND respondent_id = 5;  -- north -> south
UPDATE src.pub SET region = NULL WHERE wave = 'w1' AND release = 2 AND respondent_id = 11;    -- east -> NULL
UPDATE src.pub SET hours = hours + 10                                                      -- seven cells
WHERE wave = 'w1' AND release = 2 AND respondent_id IN (2, 4, 6, 8, 10, 14, 16);
UPDATE src.pub SET remark = 'late shift' WHERE wave = 'w1' AND release = 2 AND respondent_id = 9;  -- tab -> space
UPDATE src.pub SET weight = weight + 0.25                                                  -- ids 1..12 but 7
WHERE wave = 'w1' AND release = 2 AND respondent_id <= 12;

-- The same publications in two tables: the earlier one, and the current one (each wave's latest release).
CREATE TABLE src.pub_v1 AS
SELECT wave, respondent_id, age, region, hours, employed, remark, weight FROM src.pub WHERE release = 1;
CREATE TABLE src.pub_v2 AS
SELECT wave, respondent_id, age, region, hours, employed, remark, weight FROM src.pub p
WHERE release = (SELECT max(release) FROM src.pub q WHERE q.wave = p.wave);
