/* sl-list-members-model.c: a list's members as a GListModel
 * (sl-list-members-model.h): an array, and an item made per request. */
#include "sl-list-members-model.h"

#include <gtk/gtk.h>

struct _SlListMembersModel {
  GObject    parent_instance;

  GPtrArray *members;   /* SlListMember, owned; never NULL */
};

static void sl_list_members_model_list_model_init (GListModelInterface *iface);

G_DEFINE_FINAL_TYPE_WITH_CODE (SlListMembersModel, sl_list_members_model, G_TYPE_OBJECT,
                               G_IMPLEMENT_INTERFACE (G_TYPE_LIST_MODEL, sl_list_members_model_list_model_init))

static GType
get_item_type (GListModel *model)
{
  return GTK_TYPE_STRING_OBJECT;
}

static guint
get_n_items (GListModel *model)
{
  return SL_LIST_MEMBERS_MODEL (model)->members->len;
}

static gpointer
get_item (GListModel *model, guint position)
{
  const SlListMember *member = sl_list_members_model_get_member (SL_LIST_MEMBERS_MODEL (model), position);

  return member ? gtk_string_object_new (member->designation) : NULL;
}

static void
sl_list_members_model_list_model_init (GListModelInterface *iface)
{
  iface->get_item_type = get_item_type;
  iface->get_n_items = get_n_items;
  iface->get_item = get_item;
}

static void
sl_list_members_model_finalize (GObject *object)
{
  SlListMembersModel *self = SL_LIST_MEMBERS_MODEL (object);

  g_ptr_array_unref (self->members);
  G_OBJECT_CLASS (sl_list_members_model_parent_class)->finalize (object);
}

static void
sl_list_members_model_class_init (SlListMembersModelClass *klass)
{
  G_OBJECT_CLASS (klass)->finalize = sl_list_members_model_finalize;
}

static void
sl_list_members_model_init (SlListMembersModel *self)
{
  self->members = g_ptr_array_new_with_free_func ((GDestroyNotify) sl_list_member_free);
}

SlListMembersModel *
sl_list_members_model_new (void)
{
  return g_object_new (SL_TYPE_LIST_MEMBERS_MODEL, NULL);
}

void
sl_list_members_model_set (SlListMembersModel *self, GPtrArray *members)
{
  guint removed;

  g_return_if_fail (SL_IS_LIST_MEMBERS_MODEL (self));

  removed = self->members->len;
  g_ptr_array_unref (self->members);
  self->members = members ? members : g_ptr_array_new_with_free_func ((GDestroyNotify) sl_list_member_free);
  if (removed > 0 || self->members->len > 0)
    g_list_model_items_changed (G_LIST_MODEL (self), 0, removed, self->members->len);
}

const SlListMember *
sl_list_members_model_get_member (SlListMembersModel *self, guint position)
{
  g_return_val_if_fail (SL_IS_LIST_MEMBERS_MODEL (self), NULL);

  if (position >= self->members->len)
    return NULL;
  return self->members->pdata[position];
}
