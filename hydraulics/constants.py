"""Physical constants used by the core, all SI.

The values are fixed here once so that every module (and every test) uses the
same ones.
"""

#: Standard acceleration of gravity [m/s^2] (CGPM 1901; ISO 80000-3).
G = 9.80665

#: Unit weight of water [N/m^3], the SI value used throughout FHWA HEC-15,
#: "Design of Roadside Channels with Flexible Linings" (Kilgore and Cotton,
#: 3rd ed., 2005), e.g. in Eq. 3.1. The customary value there, 62.4 lb/ft^3,
#: is 9802 N/m^3; the 0.08 % difference is below the precision of the method.
GAMMA_WATER = 9810.0

#: Density of water [kg/m^3] (common practice, 4 to 20 C to three figures).
RHO_WATER = 1000.0

#: Kinematic viscosity of water at 20 C [m^2/s] (CRC Handbook of Chemistry and
#: Physics, water properties table; 1.003e-6 at 20 C).
NU_WATER = 1.003e-6

#: Manning's equation constant in SI [m^(1/3)/s]. The customary 1.486 is
#: (1/0.3048)^(1/3) = 1.4859 and only ever appears at the unit edges.
K_MANNING_SI = 1.0
