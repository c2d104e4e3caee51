/* sl-list-members-model.h: the members of one target list (lists.h) as a
 * GListModel for the Lists page.  The members are kept as the core read
 * them (SlListMember, highest priority first); the model's items are
 * GtkStringObjects of the designations, made when asked for and not kept,
 * so that a list of a million stars is not a million objects. */
#pragma once

#include <gio/gio.h>

#include "lists.h"

G_BEGIN_DECLS

#define SL_TYPE_LIST_MEMBERS_MODEL (sl_list_members_model_get_type ())
G_DECLARE_FINAL_TYPE (SlListMembersModel, sl_list_members_model, SL, LIST_MEMBERS_MODEL, GObject)

SlListMembersModel *sl_list_members_model_new (void);

/* Replaces the members (a GPtrArray of SlListMember from sl_list_members,
 * taken; NULL: none) and announces it as one change. */
void                sl_list_members_model_set (SlListMembersModel *self, GPtrArray *members);

/* The member at POSITION (borrowed; NULL past the end). */
const SlListMember *sl_list_members_model_get_member (SlListMembersModel *self, guint position);

G_END_DECLS
