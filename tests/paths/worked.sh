# tests/paths/worked.sh — a path worked by hand, sourced by tests/paths/run.
#
# The calc is tests/paths/worked.calc.md: 3 L/s of water at 20 degC, start
# 400 kPa; segment A 20 m of 2 in sch 40 steel, level, 2 standard 90 degree
# elbows and 1 gate valve; segment B 15 m of 1-1/2 in sch 40 steel rising
# 6 m, 1 tee (flow through run). Seven significant figures are carried by
# hand below (a pocket calculator's work, every step written out); the
# report shows four, and `build --format text` must print exactly the
# digits rounded from these numbers. The JSON values must agree with the
# hand values to 1e-6 relative (the rounding of seven-figure steps).
#
# Data and their sources
#   water at 20 degC and 101.325 kPa, IAPWS-IF97 region 1 density and the
#   IAPWS 2008 viscosity, as python3-iapws 1.5.2 gives them
#   (iapws.IAPWS97(T=293.15, P=0.101325).rho; iapws._iapws._Viscosity):
#       rho = 998.2061 kg/m^3     mu = 1.001597e-3 Pa*s
#   (handbook tables print 998.2 kg/m^3 and 1.002 mPa*s, from memory)
#   g = 9.80665 m/s^2 (standard gravity, exact, NIST SP 811)
#   pipe bores, ASME B36.10M (from memory; checked against python3-fluids
#   in tests/ref/pipes-fluids.sh): 2 in sch 40 od 2.375 in, wall 0.154 in,
#   id = 2.375 - 2*0.154 = 2.067 in = 0.0525018 m; 1-1/2 in sch 40 od
#   1.900 in, wall 0.145 in, id = 1.610 in = 0.040894 m
#   roughness of commercial steel, Moody (1944): 0.00015 ft = 0.0018 in
#   = 4.572e-5 m (from memory)
#   Crane TP-410: K = f_T*(L/D)_eq, L/D of a standard 90 degree elbow 30,
#   gate valve 8, tee through run 20 (from memory); f_T the fully rough
#   Colebrook value at eps = 0.0018 in, 1/sqrt(f_T) = -2*log10(eps/D/3.7)
#
# Segment A (D = 0.0525018 m, L = 20 m, rise 0)
#   A     = pi*D^2/4          = pi*0.0525018^2/4           = 2.164902e-3 m^2
#   V     = Q/A               = 0.003/2.164902e-3          = 1.385744 m/s
#   Re    = rho*V*D/mu        = 998.2061*1.385744*0.0525018/1.001597e-3
#                                                          = 72507.75
#   eps/D = 0.0018 in/2.067 in                             = 8.708273e-4
#   Colebrook, x = 1/sqrt(f) = -2*log10(eps/D/3.7 + 2.51*x/Re), by
#   substitution from x = 8: 6.580960, 6.668516, 6.662850, 6.663216,
#   6.663192, 6.663194, 6.663194
#   f     = 1/6.663194^2                                   = 0.02252346
#   V^2/2g = 1.385744^2/(2*9.80665)                        = 0.09790736 m
#   h_f   = f*L/D*V^2/2g      = 0.02252346*20/0.0525018*0.09790736
#                                                          = 0.8400521 m
#   f_T   : x_T = -2*log10(8.708273e-4/3.7) = 7.256539, f_T = 1/x_T^2
#                                                          = 0.01899070
#   K     = f_T*(2*30 + 8)    = 68*0.01899070              = 1.291368
#   h_m   = K*V^2/2g          = 1.291368*0.09790736        = 0.1264344 m
#   rho*g = 998.2061*9.80665                               = 9789.058 N/m^3
#   p_out = p_in - rho*g*(h_f + h_m) - rho*g*rise
#         = 400000 - 9789.058*(0.8400521 + 0.1264344) - 0
#         = 400000 - 9460.992                              = 390539.0 Pa
# Junction A -> B (energy grade line continuous)
#   p_in(B) = p_out(A) + rho*(V_A^2 - V_B^2)/2
#           = 390539.0 + 998.2061*(1.385744^2 - 2.284085^2)/2
#           = 390539.0 - 1645.422                          = 388893.6 Pa
# Segment B (D = 0.040894 m, L = 15 m, rise 6 m)
#   A     = pi*0.040894^2/4                                = 1.313436e-3 m^2
#   V     = 0.003/1.313436e-3                              = 2.284085 m/s
#   Re    = 998.2061*2.284085*0.040894/1.001597e-3         = 93089.15
#   eps/D = 0.0018/1.610                                   = 1.118012e-3
#   Colebrook from x = 8: 6.571554, 6.638682, 6.635408, 6.635568,
#   6.635560, 6.635561, 6.635561
#   f     = 1/6.635561^2                                   = 0.02271145
#   V^2/2g = 2.284085^2/(2*9.80665)                        = 0.2659952 m
#   h_f   = 0.02271145*15/0.040894*0.2659952               = 2.215900 m
#   f_T   : x_T = -2*log10(1.118012e-3/3.7) = 7.039510, f_T = 0.02017972
#   K     = 20*0.02017972                                  = 0.4035944
#   h_m   = 0.4035944*0.2659952                            = 0.1073541 m
#   p_out = 388893.6 - 9789.058*(2.215900 + 0.1073541) - 9789.058*6
#         = 388893.6 - 22742.47 - 58734.35                 = 307416.8 Pa
# Path
#   p_end = p_min = 307416.8 Pa (B outlet)    V_max = 2.284085 m/s
#   loss  = 0.8400521 + 0.1264344 + 2.215900 + 0.1073541   = 3.289741 m
#   check p_end >= 300 kPa holds, utilisation 300/307.4168 = 0.9759

worked_run() {
    local calc=tests/paths/worked.calc.md
    prun build "$calc" --format text -o -
    status_is 0 "worked: build --format text"
    cp "$TMP/out" "$TMP/worked.txt"
    # The segment rows, cell by cell: segment Q D L rise V Re f K h_f h_m p_in p_out
    row_is A "A 3.000 52.50 20.00 0 1.386 72510 0.02252 1.291 0.8401 0.1264 400.0 390.5"
    row_is B "B 3.000 40.89 15.00 6.000 2.284 93090 0.02271 0.4036 2.216 0.1074 388.9 307.4"
    line_is "line.p_end = 307.4 kPa"
    line_is "line.p_min = 307.4 kPa"
    line_is 'line.p_min_at = "B outlet"'
    line_is "line.V_max = 2.284 m/s"
    line_is "line.loss = 3.290 m"
    line_is "check outlet pressure: line.p_end >= 300 kPa : 307.4 kPa >= 300.0 kPa : HOLDS (utilisation 0.976)"

    # The JSON values against the seven-figure hand values, 1e-6 relative.
    prun check "$calc" --json
    status_is 0 "worked: check --json"
    json_near "$TMP/out" 1e-6 \
        "line.p_end=307416.8" "line.p_min=307416.8" "line.V_max=2.284085" "line.loss=3.289741" \
        "line.A.V=1.385744" "line.A.Re=72507.75" "line.A.f=0.02252346" "line.A.K=1.291368" \
        "line.A.h_f=0.8400521" "line.A.h_m=0.1264344" "line.A.p_out=390539.0" \
        "line.B.p_in=388893.6" "line.B.V=2.284085" "line.B.Re=93089.15" "line.B.f=0.02271145" \
        "line.B.K=0.4035944" "line.B.h_f=2.215900" "line.B.h_m=0.1073541" "line.B.p_out=307416.8" \
        "w.rho=998.2061" "w.mu=1.001597e-3" "a.id=0.0525018" "b.id=0.040894"
}
