/* Tapwright tap table "Kestrel midplane — lanes 0–3" v3 — signed off
 * Approved by Ines Varga on 2026-11-20T14:05:00.000Z
 * Budget: Kestrel 28G NRZ (NRZ, target BER 1e-12)
 * Architecture: TX FIR + CTLE + DFE 2
 * Generated 2026-11-21T09:30:00.000Z by engine golden-1.
 * Estimates from linear models; confirm on real hardware before production.
 */
#ifndef TW_KESTREL_MIDPLANE_LANES_03_V3_H
#define TW_KESTREL_MIDPLANE_LANES_03_V3_H

#include <stdint.h>

#define TW_KESTREL_MIDPLANE_LANES_03_VERSION 3u
/* 1 when a reviewer signed this version off; a build can refuse drafts with #if !TW_KESTREL_MIDPLANE_LANES_03_SIGNED_OFF. */
#define TW_KESTREL_MIDPLANE_LANES_03_SIGNED_OFF 1
#define TW_KESTREL_MIDPLANE_LANES_03_CLASS_COUNT 2u
#define TW_KESTREL_MIDPLANE_LANES_03_FIELD_COUNT 6u

/* tx_pre1: tx[-1], LSB 0.05 fraction, range -0.25 … 0 fraction */
#define TW_KESTREL_MIDPLANE_LANES_03_TX_PRE1_BITS 4u
#define TW_KESTREL_MIDPLANE_LANES_03_TX_PRE1_SIGNED 1
#define TW_KESTREL_MIDPLANE_LANES_03_TX_PRE1_LSB 0.05
#define TW_KESTREL_MIDPLANE_LANES_03_TX_PRE1_MIN_CODE (-5)
#define TW_KESTREL_MIDPLANE_LANES_03_TX_PRE1_MAX_CODE (0)

/* tx_main: tx[0], LSB 0.05 fraction, range 0.5 … 1 fraction */
#define TW_KESTREL_MIDPLANE_LANES_03_TX_MAIN_BITS 5u
#define TW_KESTREL_MIDPLANE_LANES_03_TX_MAIN_SIGNED 0
#define TW_KESTREL_MIDPLANE_LANES_03_TX_MAIN_LSB 0.05
#define TW_KESTREL_MIDPLANE_LANES_03_TX_MAIN_MIN_CODE (10)
#define TW_KESTREL_MIDPLANE_LANES_03_TX_MAIN_MAX_CODE (20)

/* tx_post1: tx[1], LSB 0.05 fraction, range -0.5 … 0 fraction */
#define TW_KESTREL_MIDPLANE_LANES_03_TX_POST1_BITS 5u
#define TW_KESTREL_MIDPLANE_LANES_03_TX_POST1_SIGNED 1
#define TW_KESTREL_MIDPLANE_LANES_03_TX_POST1_LSB 0.05
#define TW_KESTREL_MIDPLANE_LANES_03_TX_POST1_MIN_CODE (-10)
#define TW_KESTREL_MIDPLANE_LANES_03_TX_POST1_MAX_CODE (0)

/* ctle_gdc: ctle.gDc_dB, LSB 3 dB, range -9 … 0 dB */
#define TW_KESTREL_MIDPLANE_LANES_03_CTLE_GDC_BITS 3u
#define TW_KESTREL_MIDPLANE_LANES_03_CTLE_GDC_SIGNED 1
#define TW_KESTREL_MIDPLANE_LANES_03_CTLE_GDC_LSB 3.0
#define TW_KESTREL_MIDPLANE_LANES_03_CTLE_GDC_MIN_CODE (-3)
#define TW_KESTREL_MIDPLANE_LANES_03_CTLE_GDC_MAX_CODE (0)

/* dfe_tap1: dfe[1], LSB 0.001 V, range -0.1 … 0.1 V */
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP1_BITS 8u
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP1_SIGNED 1
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP1_LSB 0.001
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP1_MIN_CODE (-100)
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP1_MAX_CODE (100)

/* dfe_tap2: dfe[2], LSB 0.001 V, range -0.1 … 0.1 V */
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP2_BITS 8u
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP2_SIGNED 1
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP2_LSB 0.001
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP2_MIN_CODE (-100)
#define TW_KESTREL_MIDPLANE_LANES_03_DFE_TAP2_MAX_CODE (100)

enum tw_kestrel_midplane_lanes_03_class {
  TW_KESTREL_MIDPLANE_LANES_03_CLASS_LOSS_LT_16_DB = 0, /* Loss < 16 dB */
  TW_KESTREL_MIDPLANE_LANES_03_CLASS_LOSS_GE_16_DB = 1, /* Loss ≥ 16 dB */
};

typedef struct {
  int8_t tx_pre1;
  uint8_t tx_main;
  int8_t tx_post1;
  int8_t ctle_gdc;
  int8_t dfe_tap1;
  int8_t dfe_tap2;
} tw_kestrel_midplane_lanes_03_setting_t;

static const tw_kestrel_midplane_lanes_03_setting_t tw_kestrel_midplane_lanes_03_defaults[TW_KESTREL_MIDPLANE_LANES_03_CLASS_COUNT] = {
  /* Loss < 16 dB: 2 channels, worst limiter headroom 22.8 mV */
  [TW_KESTREL_MIDPLANE_LANES_03_CLASS_LOSS_LT_16_DB] = { .tx_pre1 = 0, .tx_main = 18, .tx_post1 = -2, .ctle_gdc = -1, .dfe_tap1 = 12, .dfe_tap2 = 3 },
  /* Loss ≥ 16 dB: 2 channels, worst limiter headroom 6.1 mV */
  [TW_KESTREL_MIDPLANE_LANES_03_CLASS_LOSS_GE_16_DB] = { .tx_pre1 = -1, .tx_main = 15, .tx_post1 = -4, .ctle_gdc = -3, .dfe_tap1 = 38, .dfe_tap2 = 11 },
};

#endif /* TW_KESTREL_MIDPLANE_LANES_03_V3_H */
