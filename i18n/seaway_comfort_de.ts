<?xml version="1.0" encoding="utf-8"?>
<!DOCTYPE TS>
<TS version="2.1">
<context>
    <name>@default</name>
    <message>
        <location filename="../processing/algorithms/common.py" line="82"/>
        <source>Route (line layer; optional fields name, depart_utc, speed_kn)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="86"/>
        <source>Sea-state forecast files (GRIB2, NetCDF-CF or GeoTIFF)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="90"/>
        <source>Source names (comma-separated, one per forecast file)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="94"/>
        <source>Several sources</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="94"/>
        <source>First file with data at each sample</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="94"/>
        <source>Compare: one result per file</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="99"/>
        <source>Bathymetry raster (optional; deep water when absent)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="102"/>
        <source>Departure (UTC; a route field depart_utc overrides it)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="106"/>
        <source>Speed through the water (kn; a route field speed_kn overrides it)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="110"/>
        <source>Vessel profile: a JSON file or a profile name ({})</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="114"/>
        <source>Station on board (default: the profile&apos;s first)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="117"/>
        <source>Sample spacing (NM)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="121"/>
        <source>JONSWAP peak enhancement gamma (1 = Pierson-Moskowitz)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="125"/>
        <source>Directional spreading exponent s (cos-2s)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="129"/>
        <source>Long-crested seas (no directional spreading)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="132"/>
        <source>Response method</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="132"/>
        <source>Automatic</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="132"/>
        <source>Response tables (fast)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/common.py" line="132"/>
        <source>Full spectral integration</source>
        <translation type="unfinished"></translation>
    </message>
</context>
<context>
    <name>DepartureSweepAlgorithm</name>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="152"/>
        <source>When to leave: departure sweep</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="155"/>
        <source>Passage planning</source>
        <translation type="unfinished">Reiseplanung</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="161"/>
        <source>&lt;p&gt;Runs the passage of ONE route line for every departure from DEPART_FROM to DEPART_TO (UTC) every DEPART_STEP_H hours, at each speed of SPEEDS_KN (empty: SPEED_KN), through each sea-state file separately, and ranks the departures.&lt;/p&gt;&lt;p&gt;&lt;b&gt;What best means&lt;/b&gt; (CRITERION): lowest worst-case motion sickness incidence (MSI); least time above the acceptable comfort class MAX_CLASS (0 smooth, 1 steady, 2 lively, 3 taxing, 4 punishing); lowest motion sickness dose (ISO 2631-1) at arrival; or the earliest departure that stays within limits (no sample above MAX_CLASS, inside the forecast, no IMO MSC.1/Circ.1228 guidance flag).&lt;/p&gt;&lt;p&gt;&lt;b&gt;Robust across sources&lt;/b&gt;: each departure also gets a row with source &apos;ALL (worst case)&apos;: the worst over the files, with the spread between them. The recommendation is the best of these rows and is given with its reason in the log and the report.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Outputs&lt;/b&gt;: a table (one row per departure x speed x source, plus the robust rows; fields rank, depart_utc, speed_kn, arrive_utc, duration_h, source, worst_msi_pct, worst_msi_dist_nm, worst_msi_utc, hrs_c0..hrs_c4 hours per comfort class, hrs_nodata, hrs_above, msdv_arrival, sick_pct_arrival, flags, n_missing, in_forecast, within_lim, crit_value, crit_spread, msi_spread); an HTML report with a heat map of comfort by departure and distance; optionally the point layer of the recommended departure. Departures whose passage runs past the end of a forecast are kept and marked in_forecast = false.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Caution&lt;/b&gt;: {CAUTION}&lt;/p&gt;</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="194"/>
        <source>Earliest departure (UTC)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="197"/>
        <source>Latest departure (UTC)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="200"/>
        <source>Step between departures (hours)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="204"/>
        <source>What best means</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="208"/>
        <source>Worst acceptable comfort class (0 smooth .. 4 punishing)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="212"/>
        <source>Alternative speeds (kn, comma-separated; empty: SPEED_KN)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="215"/>
        <source>Departure table</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="218"/>
        <source>Departure sweep report</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="218"/>
        <source>HTML files (*.html)</source>
        <translation type="unfinished">HTML-Dateien (*.html)</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="221"/>
        <source>Samples of the recommended departure</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="225"/>
        <source>Summary</source>
        <translation type="unfinished">Zusammenfassung</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="226"/>
        <source>Recommended departure (UTC, ISO 8601)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/departure_sweep.py" line="227"/>
        <source>Rows in the departure table</source>
        <translation type="unfinished"></translation>
    </message>
</context>
<context>
    <name>DescribeSeaStateAlgorithm</name>
    <message>
        <location filename="../processing/algorithms/describe_sea_state.py" line="62"/>
        <source>Describe a sea-state file</source>
        <translation>Seegangsdatei beschreiben</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/describe_sea_state.py" line="65"/>
        <source>Passage planning</source>
        <translation>Reiseplanung</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/describe_sea_state.py" line="71"/>
        <source>&lt;p&gt;Opens a GRIB2, NetCDF-CF or GeoTIFF sea-state file the way the passage algorithms do and lists what it finds: each variable the plugin can use (significant wave height, peak or mean periods, direction, wind-sea and swell partitions), how it was recognised (CF standard name, GRIB2 parameter code, name), its units and any conversion, the grid (size, extent, resolution, CRS), the time range and step, and anything ignored.&lt;/p&gt;&lt;p&gt;Use it to check a file before a passage run. The text goes to the log, to the DESCRIPTION output and, if asked, to an HTML or text file.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Caution&lt;/b&gt;: {CAUTION}&lt;/p&gt;</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/describe_sea_state.py" line="86"/>
        <source>Sea-state file</source>
        <translation>Seegangsdatei</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/describe_sea_state.py" line="89"/>
        <source>Description file</source>
        <translation>Beschreibungsdatei</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/describe_sea_state.py" line="89"/>
        <source>HTML files (*.html);;Text files (*.txt)</source>
        <translation>HTML-Dateien (*.html);;Textdateien (*.txt)</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/describe_sea_state.py" line="93"/>
        <source>Description</source>
        <translation>Beschreibung</translation>
    </message>
</context>
<context>
    <name>RouteComfortAlgorithm</name>
    <message>
        <location filename="../processing/algorithms/route_comfort.py" line="100"/>
        <source>Passage comfort along a route</source>
        <translation>Fahrtkomfort entlang einer Route</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/route_comfort.py" line="103"/>
        <source>Passage planning</source>
        <translation>Reiseplanung</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/route_comfort.py" line="109"/>
        <source>&lt;p&gt;Samples the route every SPACING_NM nautical miles along WGS84 geodesics, works out when the vessel reaches each sample at the given speed, reads the sea state there and then from the forecast files, and computes how the vessel moves and how the motion is likely to feel at the chosen station on board.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Route&lt;/b&gt;: a line layer in any CRS; each feature (and each part of a multi-part line) is one leg. Optional fields: &lt;code&gt;name&lt;/code&gt; (leg name), &lt;code&gt;depart_utc&lt;/code&gt; (departure, date-time or ISO 8601 text, UTC) and &lt;code&gt;speed_kn&lt;/code&gt; (knots); they override DEPARTURE and SPEED_KN.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Sea state&lt;/b&gt;: one or more GRIB2 / NetCDF-CF / GeoTIFF files; with several files the first one with data at a sample is used (or, in compare mode, each file gives its own result). Bathymetry is optional; without it deep water is assumed.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Method&lt;/b&gt;: linear wave theory at the local depth (Airy), encounter period from the relative heading (0 following, 90 beam, 180 head), JONSWAP spectra with cos-2s spreading (DNV-RP-C205), closed-form heave and pitch (Jensen, Mansour &amp;amp; Olsen 2004) and a slope-driven roll model, motion sickness incidence (O&apos;Hanlon &amp;amp; McCauley 1974), ISO 2631-1 motion sickness dose value accumulated along the passage, seakeeping criteria and IMO MSC.1/Circ.1228 guidance flags.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Outputs&lt;/b&gt;: points and segments (EPSG:4326) with fields in SI units named with their unit (hs_m, tp_s, enc_period_s, vacc_rms_m_s2, msi_pct, msdv_cum in m/s^1.5, ...), comfort_class 0-4 (smooth, steady, lively, taxing, punishing), flags (comma-separated codes), styled by class and time-enabled on eta_utc; values are NULL where nothing could be computed. An optional HTML report summarises each leg.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Caution&lt;/b&gt;: {CAUTION}&lt;/p&gt;</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/route_comfort.py" line="141"/>
        <source>Passage samples</source>
        <translation>Fahrtpunkte</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/route_comfort.py" line="144"/>
        <source>Passage segments</source>
        <translation>Fahrtabschnitte</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/route_comfort.py" line="147"/>
        <source>Passage report</source>
        <translation>Fahrtbericht</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/route_comfort.py" line="147"/>
        <source>HTML files (*.html)</source>
        <translation>HTML-Dateien (*.html)</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/route_comfort.py" line="150"/>
        <source>Summary</source>
        <translation>Zusammenfassung</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/route_comfort.py" line="151"/>
        <source>Number of samples</source>
        <translation>Anzahl der Punkte</translation>
    </message>
</context>
<context>
    <name>SeasonalClimateAlgorithm</name>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="138"/>
        <source>Seasonal comfort climate along a route</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="141"/>
        <source>Passage planning</source>
        <translation type="unfinished">Reiseplanung</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="147"/>
        <source>&lt;p&gt;From years of hindcast sea states (NetCDF-CF or GRIB2 files with significant wave height, a period and a direction, all on one grid and time step), works out for every calendar month how often the passage along the route is comfortable enough.&lt;/p&gt;&lt;p&gt;Every hindcast time step is evaluated at every route sample (spacing 1 NM) through the vessel&apos;s response table (built once), giving the comfort class 0-4 (smooth, steady, lively, taxing, punishing) at the station. Per month: the share of time within MAX_CLASS per segment and for the whole route, how often the station&apos;s seakeeping criteria are exceeded, the probability that a departure in that month keeps the whole passage (vessel moving at SPEED_KN, class taken at the nearest hindcast step when the vessel reaches each sample) within MAX_CLASS, and the mean wait from a random moment of the month to the next such departure.&lt;/p&gt;&lt;p&gt;Gaps in the hindcast are reported and never interpolated; files that overlap in time are reported (the file listed first is used); files on different grids are refused.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Computation&lt;/b&gt;: chunks of time run on WORKERS local processes, or on a Dask cluster when SCHEDULER (tcp://host:port) is given; FALLBACK_LOCAL computes locally if the scheduler cannot be reached.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Outputs&lt;/b&gt;: segments with ok_m01..ok_m12 (share 0-1; NULL for months not chosen), {STYLE_FIELD} (mean over the chosen months, used for the style), a CSV table and an HTML report.&lt;/p&gt;&lt;p&gt;&lt;b&gt;Caution&lt;/b&gt;: {CAUTION}&lt;/p&gt;</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="178"/>
        <source>Route (line layer; the first line is used)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="180"/>
        <source>Hindcast files (NetCDF-CF or GRIB2, any number of years)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="183"/>
        <source>Vessel profile: a JSON file or a profile name ({})</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="186"/>
        <source>Speed through the water (kn)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="189"/>
        <source>Station on board (default: the profile&apos;s first)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="191"/>
        <source>Months (e.g. 1-12, 6,7,8 or 11-2)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="193"/>
        <source>Worst acceptable comfort class (0 smooth ... 4 punishing)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="196"/>
        <source>Dask scheduler address (tcp://host:port; empty = local processes)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="198"/>
        <source>Local worker processes</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="201"/>
        <source>Compute locally if the Dask scheduler cannot be reached</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="203"/>
        <source>JONSWAP peak enhancement gamma (1 = Pierson-Moskowitz)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="206"/>
        <source>Directional spreading exponent s (cos-2s)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="209"/>
        <source>Seasonal climate segments</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="211"/>
        <source>Seasonal climate table</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="211"/>
        <source>CSV files (*.csv)</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="213"/>
        <source>Seasonal climate report</source>
        <translation type="unfinished"></translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="213"/>
        <source>HTML files (*.html)</source>
        <translation type="unfinished">HTML-Dateien (*.html)</translation>
    </message>
    <message>
        <location filename="../processing/algorithms/seasonal_climate.py" line="215"/>
        <source>Summary</source>
        <translation type="unfinished">Zusammenfassung</translation>
    </message>
</context>
<context>
    <name>SeawayComfortPlugin</name>
    <message>
        <location filename="../plugin/main.py" line="72"/>
        <source>Passage comfort along a route...</source>
        <translation>Fahrtkomfort entlang einer Route...</translation>
    </message>
    <message>
        <location filename="../plugin/main.py" line="72"/>
        <source>Predict motions, comfort and guidance flags along a route from sea-state forecasts</source>
        <translation>Bewegungen, Komfort und Warnhinweise entlang einer Route aus Seegangsvorhersagen abschätzen</translation>
    </message>
    <message>
        <location filename="../plugin/main.py" line="80"/>
        <source>Describe a forecast file...</source>
        <translation>Vorhersagedatei beschreiben...</translation>
    </message>
    <message>
        <location filename="../plugin/main.py" line="80"/>
        <source>List the variables, grid and time steps of a sea-state file</source>
        <translation>Variablen, Gitter und Zeitschritte einer Seegangsdatei auflisten</translation>
    </message>
    <message>
        <location filename="../plugin/main.py" line="85"/>
        <source>Vessel profiles...</source>
        <translation>Schiffsprofile...</translation>
    </message>
    <message>
        <location filename="../plugin/main.py" line="85"/>
        <source>Create, check and edit the vessel profiles the calculations use</source>
        <translation>Die Schiffsprofile für die Berechnungen anlegen, prüfen und bearbeiten</translation>
    </message>
    <message>
        <location filename="../plugin/main.py" line="125"/>
        <source>Seaway Comfort</source>
        <translation>Seaway Comfort</translation>
    </message>
    <message>
        <location filename="../plugin/main.py" line="115"/>
        <source>The Processing algorithm {0} is not available. Check that the Seaway Comfort plugin is enabled and the Processing plugin is active (Plugins &gt; Manage and Install Plugins).</source>
        <translation>Der Processing-Algorithmus {0} ist nicht verfügbar. Prüfen Sie, ob das Plugin Seaway Comfort aktiviert und das Processing-Plugin aktiv ist (Erweiterungen &gt; Erweiterungen verwalten und installieren).</translation>
    </message>
    <message>
        <location filename="../plugin/main.py" line="125"/>
        <source>QGIS&apos;s Processing framework could not be loaded: {0}</source>
        <translation>Das Processing-Framework von QGIS konnte nicht geladen werden: {0}</translation>
    </message>
</context>
<context>
    <name>VesselManagerDialog</name>
    <message>
        <location filename="../plugin/vessel_manager.py" line="122"/>
        <source>Seaway Comfort: vessel profiles</source>
        <translation>Seaway Comfort: Schiffsprofile</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="134"/>
        <source>Profile name</source>
        <translation>Profilname</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="135"/>
        <source>Description</source>
        <translation>Beschreibung</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="136"/>
        <source>Waterline length L (m)</source>
        <translation>Wasserlinienlänge L (m)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="137"/>
        <source>Beam B (m)</source>
        <translation>Breite B (m)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="138"/>
        <source>Draught T (m)</source>
        <translation>Tiefgang T (m)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="139"/>
        <source>Block coefficient Cb (fraction)</source>
        <translation>Blockkoeffizient Cb (Anteil)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="140"/>
        <source>Waterplane coefficient Cwp (fraction)</source>
        <translation>Wasserlinienkoeffizient Cwp (Anteil)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="141"/>
        <source>Metacentric height GM (m)</source>
        <translation>Metazentrische Höhe GM (m)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="142"/>
        <source>Natural roll period (s)</source>
        <translation>Eigenrollperiode (s)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="143"/>
        <source>Roll damping (fraction of critical)</source>
        <translation>Rolldämpfung (Anteil der kritischen)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="144"/>
        <source>Service speed (kn)</source>
        <translation>Dienstgeschwindigkeit (kn)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="150"/>
        <source>estimate from Cb</source>
        <translation>aus Cb schätzen</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="151"/>
        <source>not given</source>
        <translation>nicht angegeben</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="152"/>
        <source>estimate from GM</source>
        <translation>aus GM schätzen</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="157"/>
        <source>Name</source>
        <translation>Name</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="158"/>
        <source>x (m)</source>
        <translation>x (m)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="159"/>
        <source>y (m)</source>
        <translation>y (m)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="160"/>
        <source>z (m)</source>
        <translation>z (m)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="161"/>
        <source>Task (criterion)</source>
        <translation>Tätigkeit (Kriterium)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="173"/>
        <source>Profiles (examples are read-only)</source>
        <translation>Profile (Beispiele sind schreibgeschützt)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="179"/>
        <source>New</source>
        <translation>Neu</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="180"/>
        <source>Duplicate</source>
        <translation>Duplizieren</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="181"/>
        <source>Delete...</source>
        <translation>Löschen...</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="198"/>
        <source>Hull and stability</source>
        <translation>Rumpf und Stabilität</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="201"/>
        <source>e.g. my survey launch</source>
        <translation>z. B. mein Vermessungsboot</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="219"/>
        <source>Response table (CSV)</source>
        <translation>Antworttabelle (CSV)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="224"/>
        <source>Stations (where motions are evaluated)</source>
        <translation>Stationen (Orte, an denen Bewegungen ausgewertet werden)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="226"/>
        <source>x forward of midships, y to starboard, z above the waterline, all in metres.</source>
        <translation>x nach vorn ab Mittschiffs, y nach Steuerbord, z über der Wasserlinie, alles in Metern.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="238"/>
        <source>Add station</source>
        <translation>Station hinzufügen</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="239"/>
        <source>Remove station</source>
        <translation>Station entfernen</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="256"/>
        <source>Check</source>
        <translation>Prüfen</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="257"/>
        <source>Save</source>
        <translation>Speichern</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="291"/>
        <source>Your profiles are stored in: {0}</source>
        <translation>Ihre Profile werden gespeichert in: {0}</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="296"/>
        <source>{0} (example)</source>
        <translation>{0} (Beispiel)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="307"/>
        <source>{0} (cannot be read)</source>
        <translation>{0} (nicht lesbar)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="356"/>
        <source>This file cannot be read: {0}</source>
        <translation>Diese Datei ist nicht lesbar: {0}</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="374"/>
        <source>none (closed-form hull model)</source>
        <translation>keine (geschlossenes Rumpfmodell)</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="462"/>
        <source>Example profile (read-only): use Duplicate to make an editable copy.</source>
        <translation>Beispielprofil (schreibgeschützt): mit Duplizieren eine bearbeitbare Kopie anlegen.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="463"/>
        <source>Your profile: {0}</source>
        <translation>Ihr Profil: {0}</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="464"/>
        <source>Unreadable file: {0}</source>
        <translation>Nicht lesbare Datei: {0}</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="465"/>
        <source>New profile, not saved yet.</source>
        <translation>Neues Profil, noch nicht gespeichert.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="520"/>
        <source>Stations table, row {0}, column &apos;{1}&apos;: {2!r} is not a number</source>
        <translation>Stationstabelle, Zeile {0}, Spalte '{1}': {2!r} ist keine Zahl</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="535"/>
        <source>{0} (name): a profile needs a name, got {1!r}</source>
        <translation>{0} (name): ein Profil braucht einen Namen, erhalten {1!r}</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="621"/>
        <source>{0}: {1}</source>
        <translation>{0}: {1}</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="564"/>
        <source>Stations table: {0}</source>
        <translation>Stationstabelle: {0}</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="609"/>
        <source>Example profiles are read-only: use Duplicate first.</source>
        <translation>Beispielprofile sind schreibgeschützt: zuerst Duplizieren.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="615"/>
        <source>{0}: {1!r} is the name of an example profile; choose another name.</source>
        <translation>{0}: {1!r} ist der Name eines Beispielprofils; bitte einen anderen Namen wählen.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="628"/>
        <source>Replace vessel profile?</source>
        <translation>Schiffsprofil ersetzen?</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="628"/>
        <source>{0}

Replace it?</source>
        <translation>{0}

Ersetzen?</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="630"/>
        <source>Not saved: the existing file was kept.</source>
        <translation>Nicht gespeichert: die vorhandene Datei bleibt erhalten.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="638"/>
        <source>Saved {0!r} to {1}</source>
        <translation>{0!r} gespeichert in {1}</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="662"/>
        <source>Fill in the name and your vessel&apos;s particulars, then Save.</source>
        <translation>Namen und Daten Ihres Schiffs eintragen, dann Speichern.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="672"/>
        <source>{0} copy</source>
        <translation>{0} Kopie</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="681"/>
        <source>Editable copy {0!r} made; change it as needed, then Save.</source>
        <translation>Bearbeitbare Kopie {0!r} angelegt; nach Bedarf ändern, dann Speichern.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="688"/>
        <source>Only your own saved profiles can be deleted.</source>
        <translation>Nur eigene gespeicherte Profile können gelöscht werden.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="691"/>
        <source>Delete vessel profile?</source>
        <translation>Schiffsprofil löschen?</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="691"/>
        <source>Delete {0} permanently?</source>
        <translation>{0} endgültig löschen?</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="701"/>
        <source>Deleted {0}</source>
        <translation>{0} gelöscht</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="406"/>
        <source>Discard changes?</source>
        <translation>Änderungen verwerfen?</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="406"/>
        <source>The profile {0!r} has unsaved changes. Discard them?</source>
        <translation>Das Profil {0!r} hat ungespeicherte Änderungen. Verwerfen?</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="599"/>
        <source>natural roll period {0:.2f} s</source>
        <translation>Eigenrollperiode {0:.2f} s</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="603"/>
        <source>Profile {0!r} is valid: {1}.</source>
        <translation>Profil {0!r} ist gültig: {1}.</translation>
    </message>
    <message>
        <location filename="../plugin/vessel_manager.py" line="640"/>
        <source>Saved {0!r} to {1}; the profile in {2} is kept (delete it if it is no longer needed).</source>
        <translation>{0!r} gespeichert in {1}; das Profil in {2} bleibt erhalten (löschen, falls nicht mehr benötigt).</translation>
    </message>
</context>
</TS>
