/**
 * Packet-link decoding: line states of D-PHY-like lanes from their single-ended legs, high-speed
 * bursts aligned on the sync byte and merged across lanes, DSI packets with ECC and checksum,
 * display commands, an init-sequence export and frames; plus a generic framed-link profile.
 * Entry point: {@link org.lanesift.plugins.packetlink.PacketLinkPlugin}.
 */
package org.lanesift.plugins.packetlink;
