// Scale tolerances and the default standard uncertainty of one platform reading.
//
// Sources (see /work/shared/notes/references.md):
//  - NIST Handbook 44 §2.20, Table 6, maintenance tolerances in scale divisions d:
//      Class III L: 1 d for 0-500 d, 2 d for 501-1000 d, then 1 d more for each further 500 d
//                   or fraction of 500 d -- FROM MEMORY (not yet read at the source).
//      Class III:   1 d for 0-500 d, 2 d for 501-2000 d, 3 d for 2001-4000 d, 5 d above
//                   (second-hand quotation of the 2023 edition).
//  - HB 44 T.N.3.2: acceptance tolerance = one-half the maintenance tolerance (second-hand).
//  - HB 44 Table 3, Class III L: division value >= 5 lb; 2 000 to 10 000 divisions.
//  - OIML R 76 class III maximum permissible error (initial verification): 0.5 e for 0-500 e,
//    1.0 e for 500-2000 e, 1.5 e for 2000-10000 e; in service twice these (as enacted in
//    UK SI 1995/1907, Sch. 2, Table 3).
//  - JCGM 100:2008 (GUM) §4.3.7: a value known only to lie within +-a, uniformly: u = a/sqrt(3).
// Loads are given in divisions (load / d, need not be an integer); results are in divisions
// unless the name says otherwise. Negative loads are treated by their magnitude.
#pragma once
#include <optional>
#include <string>
#include <string_view>

#include "core/units.h"

namespace sp {

enum class ScaleClass { hb44_iii_l, hb44_iii, oiml_iii };

// "IIIL" (also "III L") -> HB 44 Class III L; "III" -> HB 44 Class III; "OIML-III" -> OIML R 76
// class III. nullopt for anything else.
std::optional<ScaleClass> parse_scale_class(std::string_view s);

// HB 44 Table 6 maintenance tolerance, in divisions, at a load of `divisions` d.
double hb44_maintenance_tolerance_iii_l(double divisions);
double hb44_maintenance_tolerance_iii(double divisions);
// HB 44 T.N.3.2: half the maintenance tolerance.
double hb44_acceptance_tolerance(ScaleClass c, double divisions);
// OIML R 76 class III MPE in scale intervals e; in_service doubles it.
double oiml_mpe_iii(double intervals, bool in_service);

// The tolerance in divisions that bounds a reading in service: HB 44 maintenance tolerance, or
// OIML in-service MPE.
double in_service_tolerance(ScaleClass c, double divisions);

// Default standard uncertainty of one reading, in the weight unit: tol / sqrt(3) (GUM §4.3.7),
// tol = in-service tolerance at the reading's load x division. Precondition: division > 0.
double default_reading_uncertainty(ScaleClass c, double reading, double division);

// HB 44 Table 3 division limits for Class III L (d >= 5 lb; 2 000 to 10 000 divisions of the
// capacity). `division` and `capacity` in `unit`. `ok` false with a reason when implausible.
struct DivisionCheck {
  bool ok = true;
  std::string reason;           // empty when ok
  std::optional<double> count;  // capacity / division, when capacity is known
};
DivisionCheck check_division_iii_l(double division, std::optional<double> capacity,
                                   WeightUnit unit);

}  // namespace sp
