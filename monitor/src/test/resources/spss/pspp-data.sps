* The PSPP round-trip dataset: GNU PSPP 1.6.2 (Debian pspp).
* write-pspp.sh runs this file, then saves it three ways (uncompressed, bytecode-compressed, zlib-compressed).
DATA LIST LIST (";") /id (F4.0) region (F2.0) income (F8.2) age (F3.0) tenure (A4) employer (A20) comment (A300) visit (DATE11) adate (ADATE10) edate (EDATE10) sdate (SDATE10) jdate (JDATE7) stamp (DATETIME20) ymd (YMDHMS19) clock (TIME8) span (DTIME11) wt (F6.3) satisf (F1.0).
BEGIN DATA
1;1;1200.50;34;COUN;Public sector body;Très long commentaire qui dépasse deux cent cinquante-cinq octets: xxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxxx end;15-JAN-2024;01/15/2024;15.01.2024;2024/01/15;2024015;15-JAN-2024 08:30:05;2024-01-15 08:30:05;08:30:05;1 02:03:04;1.250;5
2;2;850.25;51;OWN;Private firm;short;31-DEC-1999;12/31/1999;31.12.1999;1999/12/31;1999365;31-DEC-1999 23:59:59;1999-12-31 23:59:59;23:59:59;0 00:00:01;0.500;4
3;-9;-99;-1;XX;NONE GIVEN;;15-OCT-1582;10/15/1582;15.10.1582;1582/10/15;1583001;15-OCT-1582 00:00:00;1582-10-15 00:00:00;00:00:00;10 00:00:00;2.000;9
4;3;-95;70;PRIV;Charity;Ünïcödé ✓;;;;;;;;;;1.000;1
5;-8;-1;-7;COUN;NONE GIVEN;x;01-JUN-2030;06/01/2030;01.06.2030;2030/06/01;2030152;01-JUN-2030 12:00:00;2030-06-01 12:00:00;12:00:00;0 12:00:00;0.750;3
6;5;3000;18;;Public sector body;y;29-FEB-2024;02/29/2024;29.02.2024;2024/02/29;2024060;29-FEB-2024 06:07:08;2024-02-29 06:07:08;06:07:08;2 00:00:00;1.500;2
7;4;-98;44;XX;Private firm;z;01-JAN-1970;01/01/1970;01.01.1970;1970/01/01;1970001;01-JAN-1970 00:00:00;1970-01-01 00:00:00;00:00:01;0 00:00:00;1.000;8
8;;410.75;29;OWN;Charity;;01-MAR-2000;03/01/2000;01.03.2000;2000/03/01;2000061;01-MAR-2000 00:00:01;2000-03-01 00:00:01;01:00:00;0 01:00:00;3.000;1
END DATA.
VARIABLE LABELS region 'Region of residence' /income 'Net monthly income (€)' /age 'Age in years'
  /tenure 'Tenure of the home' /employer 'Employer type' /comment 'Open comment' /visit 'Visit date'
  /stamp 'Interview start' /wt 'Design weight' /satisf 'Satisfaction with the service'.
VALUE LABELS region 1 'Île-de-France' 2 'Zürich' 3 'Łódź' 4 'North East' 5 'Council tenant' -9 'Refused'
  /income -99 'Refused' -1 "Don't know"
  /tenure 'COUN' 'Council tenant' 'OWN' 'Owner occupier' 'XX' 'Not asked'
  /employer 'Private firm' 'Private company or firm' 'NONE GIVEN' 'No answer'
  /satisf 1 'Very unhappy' 5 'Very happy' 8 "Don't know" 9 'Refused'.
MISSING VALUES region (-9, -8) /income (-99 THRU -91, -1) /age (LO THRU -1) /satisf (8 THRU HI)
  /tenure ('XX').
VARIABLE LEVEL region tenure employer (NOMINAL) /satisf (ORDINAL) /income age wt (SCALE).
FORMATS wt (F6.3).
WEIGHT BY wt.
DOCUMENT Quarterly household survey, round-trip fixture.
FILE LABEL Household survey fixture.
